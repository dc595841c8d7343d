import type { MaintenanceEntry, TripResult } from '@thermargin/shared';
import { marginThresholds } from '@thermargin/core/health/thresholds';
import { createRng } from '@thermargin/core/stats/prng';
import { designMargin } from '@thermargin/core/trip/design-point';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import { cleanK, type VehicleType, vehicleModel } from './vehicles.ts';

/**
 * Trip-level fleet generator for the health tests: TripResult sequences whose k, margin, LAT, soak
 * offsets and fan/coolant evidence follow one physical story.
 * - Fouling (Kern & Seaton): 1/k = (1/k_clean)·(1 + a·(1 − e^{−t/τ})) from the last cleaning; the fan
 *   band loses `fan_share` of the ram band's a (fouling shows most in ram, docs/operating-bands.md).
 * - Fan fault: airflow × (1 − loss) in the fan band, so k × (1 − loss)^n (k ∝ v^n); the fan then sits
 *   at full duty more often.
 * - Ambient sensor reading high by b: ITD reads b smaller, so k reads ITD/(ITD − b) high; the soak
 *   check at key-on shows coolant b below the (wrong) ambient.
 * - Margin and LAT come from the trip's band k through core's design-point code (margin =
 *   kA·(T_lim − T_amb)/Q − 1, LAT = T_lim − Q/kA), so they are consistent with k by construction.
 */
export interface ScenarioParams {
  type: VehicleType;
  seed: number;
  days: number;
  /** Mean trips per day (Poisson). */
  trips_per_day: number;
  /** Relative 1σ trip-to-trip noise on k (0.02–0.05). */
  k_noise: number;
  /** %: clean design-point margin. */
  clean_margin_pct: number;
  /** Probability that a trip has enough ram-band data. */
  p_ram: number;
  /** Probability of fan-band data on a 15 °C day; rises 3 points per K warmer. */
  p_fan_15c: number;
  /** Gives a bench k (the clean k × this factor) to the fleet file; null for none. */
  bench_factor: number | null;
  /** With a radiator outlet sensor: coolant_dt_per_kw is reported. */
  outlet_sensor: boolean;
  fouling: { a_ram: number; tau_days: number; fan_share: number } | null;
  fan_fault: { day: number; airflow_loss: number } | null;
  cleaning_day: number | null;
  ambient_bias: { day: number; k: number } | null;
  coolant_fault: { day: number; flow_loss: number } | null;
  /** From `day`, this share of trips carries a sensor flag (a stuck coolant reading, say) and no k. */
  sensor_flags: { day: number; share: number } | null;
}

export interface TripTruth {
  day: number;
  health_ram: number;
  health_fan: number;
  /** %: noise-free design-point margin with true sensors. */
  margin_pct: number;
  /** The policy's rule applied to the truth. */
  status: 'ok' | 'watch' | 'inspect';
  cold_start: boolean;
  fan_data: boolean;
}

export interface Scenario {
  params: ScenarioParams;
  vehicle: VehicleModel;
  trips: TripResult[];
  truth: TripTruth[];
}

const START_MS = Date.parse('2025-03-01T00:00:00Z');
const DAY = 86_400_000;

function poisson(mean: number, u: () => number): number {
  const L = Math.exp(-mean);
  let k = 0;
  let p = u();
  while (p > L) {
    k++;
    p *= u();
  }
  return k;
}

export function generateScenario(s: ScenarioParams): Scenario {
  const rng = createRng(s.seed);
  const clean = cleanK(s.type, s.clean_margin_pct);
  const maintenance: MaintenanceEntry[] = [];
  if (s.cleaning_day !== null)
    maintenance.push({ date: isoDate(s.cleaning_day), action: 'radiator_cleaned' });
  const vehicle = vehicleModel(s.type, {
    maintenance,
    ...(s.bench_factor === null
      ? {}
      : { bench_k_w_m2k: { ram: clean.ram * s.bench_factor, fan: clean.fan * s.bench_factor } }),
  });
  const th = marginThresholds(vehicle.policy, vehicle.coolant_limit_c, vehicle.design.ambient_c);
  const n_exp = vehicle.airside.velocity_exponent;
  const trips: TripResult[] = [];
  const truth: TripTruth[] = [];
  let lastEnd = START_MS - 12 * 3_600_000;
  for (let day = 0; day < s.days; day++) {
    const count = poisson(s.trips_per_day, rng.uniform);
    let t = START_MS + day * DAY + (5.5 + rng.uniform()) * 3_600_000;
    for (let j = 0; j < count; j++) {
      const dur = (1 + 2 * rng.uniform()) * 3_600_000;
      const seasonal = 18 + 9 * Math.sin((2 * Math.PI * (day - 20)) / 365);
      const ambient = seasonal + 3 * rng.normal();
      // Fouling grows continuously: read at the trip's start, not at the start of its day.
      const at = (t - START_MS) / DAY;
      const sinceClean = s.cleaning_day !== null && day >= s.cleaning_day ? at - s.cleaning_day : at;
      const g = s.fouling ? 1 - Math.exp(-sinceClean / s.fouling.tau_days) : 0;
      let hRam = s.fouling ? 1 / (1 + s.fouling.a_ram * g) : 1;
      let hFan = s.fouling ? 1 / (1 + s.fouling.a_ram * s.fouling.fan_share * g) : 1;
      const fanBroken = s.fan_fault !== null && day >= s.fan_fault.day;
      if (fanBroken) hFan *= (1 - s.fan_fault!.airflow_loss) ** n_exp;
      const coolantBad = s.coolant_fault !== null && day >= s.coolant_fault.day;
      if (coolantBad) {
        hRam *= 1 - 0.4 * s.coolant_fault!.flow_loss;
        hFan *= 1 - 0.4 * s.coolant_fault!.flow_loss;
      }
      const bias = s.ambient_bias !== null && day >= s.ambient_bias.day ? s.ambient_bias.k : 0;
      const coolant = vehicle.coolant_limit_c - 12 + 3 * rng.normal();
      const itd = Math.max(8, coolant - ambient);
      const apparent = itd / (itd - bias);
      const flagging = s.sensor_flags !== null && day >= s.sensor_flags.day;
      const flagged = flagging && rng.uniform() < s.sensor_flags!.share;
      const hasRam = rng.uniform() < s.p_ram;
      const hasFan = rng.uniform() < Math.min(0.9, Math.max(0, s.p_fan_15c + 0.03 * (ambient - 15)));
      const noisy = (k: number) => k * (1 + s.k_noise * rng.normal());
      const kRam = hasRam ? noisy(clean.ram * hRam * apparent) : null;
      const kFan = hasFan ? noisy(clean.fan * hFan * apparent) : null;
      const m = designMargin(vehicle, { ram: kRam, fan: kFan });
      const trueM = designMargin(vehicle, { ram: clean.ram * hRam, fan: clean.fan * hFan }).margin_pct!;
      const worst = Math.min(hRam, hFan);
      const cold = t - lastEnd >= 6 * 3_600_000;
      const heat = vehicle.design.heat_kw * (0.3 + 0.2 * rng.uniform());
      const satBase = Math.min(1, Math.max(0, 0.02 + 0.01 * (ambient - 20)));
      const dtPerKw = (0.05 / (coolantBad ? 1 - s.coolant_fault!.flow_loss : 1)) * (1 + 0.03 * rng.normal());
      const start = new Date(t).toISOString();
      const end = new Date(t + dur).toISOString();
      trips.push({
        trip: `${vehicle.id}-${trips.length}`,
        start,
        end,
        samples: Math.round(dur / 1000),
        rejected: 0,
        distance_km: (dur / 3_600_000) * 35,
        k_ram_w_m2k: kRam,
        k_ram_ci95: kRam === null ? null : [kRam * 0.97, kRam * 1.03],
        n_ram: kRam === null ? 0 : 120,
        k_ram_reason: kRam === null ? 'too little ram-band data' : null,
        k_fan_w_m2k: kFan,
        k_fan_ci95: kFan === null ? null : [kFan * 0.96, kFan * 1.04],
        n_fan: kFan === null ? 0 : 60,
        k_fan_reason: kFan === null ? 'too little fan-band data' : null,
        heat_kw_mean: heat,
        heat_kw_p95: heat * 1.6,
        heat_kw_max: heat * 2,
        heat_kwh: (heat * dur) / 3_600_000,
        derate_s: 0,
        coolant_max_c: coolant + 4,
        ambient_max_c: ambient + 3 + bias,
        margin_pct: m.margin_pct,
        limiting_ambient_c: m.limiting_ambient_c,
        margin_basis: m.basis,
        ambient_mean_c: ambient + bias,
        soak_offset_k: cold ? 0.5 * rng.uniform() + 0.6 * rng.normal() - bias : null,
        fan_saturated_share: Math.min(1, satBase + (fanBroken ? 0.3 : 0) + 0.02 * rng.uniform()),
        coolant_dt_per_kw: s.outlet_sensor ? dtPerKw : null,
        sensor_flags: flagged ? ['coolant_in_c stuck at one value for 20 min'] : [],
      });
      truth.push({
        day,
        health_ram: hRam,
        health_fan: hFan,
        margin_pct: trueM,
        status:
          trueM < th.inspect_enter || worst < vehicle.policy.inspect_health_ratio
            ? 'inspect'
            : trueM < th.watch_enter ||
                1 - worst >= vehicle.policy.watch_health_drop_pct / 100 ||
                bias !== 0 ||
                flagging
              ? 'watch'
              : 'ok',
        cold_start: cold,
        fan_data: kFan !== null,
      });
      lastEnd = t + dur;
      t = lastEnd + (0.3 + 2 * rng.uniform()) * 3_600_000;
    }
  }
  return { params: s, vehicle, trips, truth };
}

export function isoDate(day: number): string {
  return new Date(START_MS + day * DAY).toISOString().slice(0, 10);
}
