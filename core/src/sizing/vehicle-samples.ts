import type { SampleColumns, TripResult } from '@thermargin/shared';
import { heatToCoolant_kw } from '../drivetrain/heat.ts';
import { dryAirDensity_kg_m3 } from '../properties/air.ts';
import { medianK } from '../trip/band-estimate.ts';
import { ESTIMATOR_DEFAULTS } from '../trip/estimator-options.ts';
import { priorReferral, windowK_w_m2k } from '../trip/refer.ts';
import type { TripSpan } from '../trip/split.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { DerateTally } from './derate-tally.ts';
import { DutyHistograms } from './duty-cycle.ts';
import { type BandK, fieldKaModel } from './field-ka.ts';
import { LogHistogram } from './log-histogram.ts';
import type { SizingOptions, WhatIfScenario } from './options.ts';
import { LoopReplay } from './replay.ts';
import { RoadLoadFit } from './road-load-fit.ts';
import { tripK } from './trip-k.ts';

/** km/h: speeds from which the vehicle counts as moving (for its typical speed). */
const MOVING_KMH = 5;
const SPEED_BINS = Object.freeze({ floor: MOVING_KMH, ceiling: 250, ratio: 0.01 });
/**
 * Samples the road-load fit takes: moving at ≥ 15 km/h (F = P/v blows up near standstill), under
 * traction (braking and regeneration are capped by the drivetrain, not road load), not derated, with
 * neighbours at most 2 s away for the acceleration, which stays within ±1.5 m/s² (our choice).
 */
const FIT = { min_kmh: 15, max_gap_ms: 2000, max_accel_ms2: 1.5 } as const;

/** One scenario's replay of one vehicle. */
export interface ScenarioReplay {
  scenario: WhatIfScenario;
  coolant_limit_c: number;
  tally: DerateTally;
  /** h of driving not replayed because no k was known (neither field nor bench). */
  skipped_s: number;
}

/**
 * A vehicle's sample-level sizing evidence, fed piece by piece with the cleaned columns and trip spans
 * the analysis worked on and the trips it made of them (so each trip's own k drives the replay). Memory is fixed
 * per vehicle (histograms and per-day tallies), whatever the number of samples.
 *
 * Recorded derates (derate = 1): events, hours, and the energy not delivered, estimated as
 * ∫ max(P_demand − P, 0) dt over derated samples, with the demand P_demand the exponentially weighted
 * mean traction power (time constant `demand_tau_s`) up to the event's start: the load that drove the
 * loop to its limit, taken as what the driver kept asking for. The same mean, as heat, is the event's
 * onset heat.
 */
export class VehicleSamples {
  readonly duty: DutyHistograms;
  readonly derate = new DerateTally();
  /** Heat generated (kW) over derated time, time-weighted. */
  readonly heatWhileDerated = new LogHistogram();
  /** Heat (kW) of the demand mean at each recorded derate's onset, one count per event. */
  readonly onsetHeat = new LogHistogram();
  readonly replays: ScenarioReplay[];
  /** The vehicle's road load (mass, CdA, Crr) fitted from its samples, for the drivetrain comparison. */
  readonly roadLoad = new RoadLoadFit();
  /** km/h of the time driven at ≥ MOVING_KMH, time-weighted: the vehicle's typical speed. */
  readonly movingSpeed = new LogHistogram(SPEED_BINS);
  samples = 0;
  private last: BandK;
  private readonly kaAt: ReturnType<typeof fieldKaModel>;
  private readonly bench: BandK;

  constructor(
    readonly vehicle: VehicleModel,
    private readonly o: SizingOptions,
  ) {
    this.duty = new DutyHistograms(o.speed_edges_kmh, o.ambient_edges_c);
    this.kaAt = fieldKaModel(vehicle);
    this.bench = { ram: vehicle.bench_k_w_m2k?.ram ?? null, fan: vehicle.bench_k_w_m2k?.fan ?? null };
    this.last = { ram: null, fan: null };
    this.replays = o.what_if.map((scenario) => {
      const coolant_limit_c = vehicle.coolant_limit_c - scenario.limit_drop_k;
      if (!(coolant_limit_c > vehicle.thermostat_open_c))
        throw new RangeError(
          `what-if limit drop ${scenario.limit_drop_k} K puts ${vehicle.id}'s limit (${coolant_limit_c} °C) at or below its thermostat opening (${vehicle.thermostat_open_c} °C)`,
        );
      return { scenario, coolant_limit_c, tally: new DerateTally(), skipped_s: 0 };
    });
  }

  /**
   * k of a trip per band: its own (unflagged), else the latest earlier trip's, else the bench k. Made
   * from the trip's windows with the fleet file's air side, as the trip stage made it: the replay runs
   * while the samples stream, before the vehicle stage has seen every trip, and the trip results the
   * stores hold are the vehicle stage's (the replay moves k back along the same air side, so the shape
   * cancels to first order).
   */
  private tripK(t: TripResult): BandK {
    const own = (b: 'ram' | 'fan') => {
      if (!t.windows) return tripK(t, b);
      if (t.sensor_flags.length > 0) return null;
      const k = windowK_w_m2k(b, t.windows[b], this.vehicle.radiator_area_m2, priorReferral(this.vehicle));
      return medianK(k, ESTIMATOR_DEFAULTS)?.k_w_m2k ?? null;
    };
    this.last.ram = own('ram') ?? this.last.ram;
    this.last.fan = own('fan') ?? this.last.fan;
    return { ram: this.last.ram ?? this.bench.ram, fan: this.last.fan ?? this.bench.fan };
  }

  /**
   * One analysed piece as the analysis saw it (analyzeVehicle's `cleaned` and `spans`, or tripPieces'):
   * `trips[j]` is the result of `spans[j]`.
   */
  add(cleaned: SampleColumns, spans: readonly TripSpan[], trips: readonly TripResult[]): void {
    spans.forEach((span, j) => {
      this.addTrip(cleaned, span.from, span.to, this.tripK(trips[j]!));
    });
  }

  private addTrip(c: SampleColumns, from: number, to: number, k: BandK): void {
    const v = this.vehicle;
    const o = this.o;
    const maxStep_ms = ESTIMATOR_DEFAULTS.max_step_s * 1000;
    const loops = this.replays.map(
      (r) =>
        new LoopReplay({
          thermal_mass_kj_per_k: v.thermal_mass_kj_per_k,
          thermostat_open_c: v.thermostat_open_c,
          coolant_limit_c: r.coolant_limit_c,
          drivetrain_efficiency: v.drivetrain_efficiency,
          coolant_heat_fraction: v.coolant_heat_fraction,
          release_k: o.derate_release_k,
        }),
    );
    const canReplay = this.kaAt(k, 0, 100) !== null;
    for (const l of loops) l.start(c.coolant_in_c[from]!);
    let demand_kw = Math.max(c.power_kw[from]!, 0);
    for (let i = from; i < to; i++) {
      const t = c.time_ms[i]!;
      const dt_s = i + 1 < to ? Math.min(c.time_ms[i + 1]! - t, maxStep_ms) / 1000 : 0;
      const p = Math.max(c.power_kw[i]!, 0);
      const q = heatToCoolant_kw(p, v.drivetrain_efficiency, v.coolant_heat_fraction);
      const speed = c.speed_kmh[i]!;
      const amb = c.ambient_c[i]!;
      this.samples++;
      this.duty.add(q, speed, amb, dt_s);
      if (speed >= MOVING_KMH) this.movingSpeed.add(speed, dt_s);
      if (i > from && i + 1 < to) this.fitRoadLoad(c, i);

      const derated = c.derate[i] === 1;
      const lost_kwh = derated ? (Math.max(demand_kw - p, 0) * dt_s) / 3600 : 0;
      if (this.derate.add(t, dt_s, derated, lost_kwh))
        this.onsetHeat.add(heatToCoolant_kw(demand_kw, v.drivetrain_efficiency, v.coolant_heat_fraction), 1);
      if (derated) this.heatWhileDerated.add(q, dt_s);
      else demand_kw += (p - demand_kw) * (1 - Math.exp(-dt_s / o.demand_tau_s));

      this.replays.forEach((r, s) => {
        if (!canReplay) {
          r.skipped_s += dt_s;
          return;
        }
        const loop = loops[s]!;
        const fan = loop.temp_c >= r.coolant_limit_c - o.fan_full_within_k ? 100 : c.fan_pct[i]!;
        const ambR = amb + r.scenario.ambient_rise_k;
        const step = loop.step(q, this.kaAt(k, speed, fan)!, ambR, dt_s);
        r.tally.add(t, dt_s, step.derated, step.not_delivered_kwh);
      });
    }
    this.derate.endTrip();
    for (const r of this.replays) r.tally.endTrip();
  }

  /** Sample i (with neighbours i ± 1 in the same trip) to the road-load fit, when it qualifies. */
  private fitRoadLoad(c: SampleColumns, i: number): void {
    const t0 = c.time_ms[i - 1]!;
    const t2 = c.time_ms[i + 1]!;
    const v_kmh = c.speed_kmh[i]!;
    if (v_kmh < FIT.min_kmh || c.derate[i] === 1 || !(c.power_kw[i]! > 0)) return;
    if (t2 - c.time_ms[i]! > FIT.max_gap_ms || c.time_ms[i]! - t0 > FIT.max_gap_ms) return;
    const a = (c.speed_kmh[i + 1]! - c.speed_kmh[i - 1]!) / 3.6 / ((t2 - t0) / 1000);
    if (!(Math.abs(a) <= FIT.max_accel_ms2)) return;
    this.roadLoad.add(v_kmh / 3.6, a, c.power_kw[i]!, dryAirDensity_kg_m3(c.ambient_c[i]!));
  }
}
