import type { BandWindowsEvidence, SampleColumns } from '@thermargin/shared';
import { heatToCoolant_kw } from '../drivetrain/heat.ts';
import { LineSums } from '../stats/line-sums.ts';
import { glycolCp_j_kgk, glycolDensity_kg_m3 } from '../properties/glycol.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { type Band, bandOf } from './bands.ts';
import type { EstimatorOptions } from './estimator-options.ts';
import { FullOpenGate } from './full-open.ts';
import { roundTo as round } from '../stats/round.ts';

/** What the windows of one band gave on one trip. */
export interface BandWindows {
  /** What each accepted window is made of (the trip result carries it; refer.ts makes k of it). */
  evidence: BandWindowsEvidence;
  /** Samples in accepted windows. */
  samples: number;
  /** Samples that were in the band with the radiator in charge (before window rules). */
  eligible: number;
  /** °C: coolant_in of band samples warm (≥ thermostat_open_c, ITD ≥ the minimum) but below full open. */
  held_c: number[];
  /** Windows rejected, by rule. */
  rejected: { short: number; low_heat: number; not_steady: number };
}

export interface TripWindows {
  ram: BandWindows;
  fan: BandWindows;
  /** K/kW: radiator temperature drop per kW rejected, one per accepted window with an outlet sensor. */
  dt_per_kw: number[];
}

/** A band's window evidence with no windows yet. */
export function emptyEvidence(): BandWindowsEvidence {
  return { speed_kmh: [], fan_pct: [], itd_k: [], balance_kw: [], meter_kw: [], flow_lpm: [] };
}

function emptyBand(): BandWindows {
  return {
    evidence: emptyEvidence(),
    samples: 0,
    eligible: 0,
    held_c: [],
    rejected: { short: 0, low_heat: 0, not_steady: 0 },
  };
}

/** Running sums of one window; times in seconds from the window's first sample. */
class WindowSums {
  band: Band | null = null;
  t0_ms = 0;
  last_ms = 0;
  n = 0;
  /** Index of the window's first sample. */
  i0 = 0;
  sq = 0;
  sItd = 0;
  sItdV2 = 0;
  sItdF2 = 0;
  nFlow = 0;
  sFlowDt = 0;
  sFlow = 0;
  nOut = 0;
  sDt = 0;
  sTmean = 0;
  /** False once a coolant reading off a 1 °C grid is seen (SAE J1939 SPN 110 resolution). */
  coarse = true;

  start(band: Band, t_ms: number, i: number): void {
    this.band = band;
    this.t0_ms = t_ms;
    this.i0 = i;
    this.n = this.sq = this.sItd = this.sItdV2 = this.sItdF2 = 0;
    this.nFlow = this.sFlowDt = this.sFlow = this.nOut = this.sDt = this.sTmean = 0;
    this.coarse = true;
  }
}

/**
 * Radiator-in-charge windows of one trip (docs/methods.md §4: Q = k·A·ITD, heat rejected = heat generated
 * − C·dT/dt, or ρ·cp·V̇·(T_in − T_out) with a flow meter). Each accepted window of ≤ window_s keeps
 * its heat rejected, mean ITD and air condition (speed and fan duty as ITD-weighted root mean squares,
 * so the face velocity √(ram² + fan²) of airside.ts is exact at the window's mean square); refer.ts
 * makes its k at the band's reference condition from them. The heat stored is C·(T_last − T_first) /
 * duration, each end temperature from a least-squares line through the samples within storage_edge_s
 * of it: the window's energy balance then holds whatever the temperature's course inside it (a slope
 * fitted over the whole window weights its middle, and misread windows whose heat varies by ±2 % of
 * k on the forward model), while the local lines average the sensor noise.
 * Sensor lag: a first-order sensor of time constant τ reads T_m with τ·dT_m/dt = T − T_m. Passing the
 * heat generated through the same lag gives L[q] − C·dT_m/dt = kA·(T_m − T_amb) exactly for constant
 * kA, so heat and measured temperature stay aligned in fast stop-and-go.
 * The steady-state and low-heat rules count the fleet file's unmeasured heat (aux_heat_kw) in the
 * heat generated; the heat balance kept leaves it out (refer.ts adds what the vehicle stage learned).
 */
export function tripWindows(
  c: SampleColumns,
  from: number,
  to: number,
  v: VehicleModel,
  o: EstimatorOptions,
  /** Whether the sample before `from` found the thermostat fully open (full-open.ts). */
  startOpen = false,
): TripWindows {
  const out: TripWindows = { ram: emptyBand(), fan: emptyBand(), dt_per_kw: [] };
  const C_kj_k = v.thermal_mass_kj_per_k;
  const minHeat_kw = Math.max(o.min_heat_kw, o.min_heat_share_of_design * v.design.heat_kw);
  const w = new WindowSums();

  const edge_ms = o.storage_edge_s * 1000;
  /**
   * °C at the window's first (head) or last sample: the least-squares line through the samples within
   * storage_edge_s of it, evaluated there (a local fit averages the noise without the lag of a mean).
   */
  const edgeTemperature = (end: number, head: boolean): number => {
    const at = head ? w.t0_ms : w.last_ms;
    const line = new LineSums();
    for (let i = head ? w.i0 : end - 1; head ? i < end : i >= w.i0; head ? i++ : i--) {
      const x = (c.time_ms[i]! - at) / 1000;
      if (Math.abs(x) * 1000 > edge_ms) break;
      line.add(x, c.coolant_in_c[i]!);
    }
    return line.valueAtZero();
  };

  const close = (end: number): void => {
    const band = w.band;
    if (band === null) return;
    w.band = null;
    const res = out[band];
    if (w.n < 3 || (w.last_ms - w.t0_ms) / 1000 < o.min_window_s) {
      res.rejected.short++;
      return;
    }
    const qGen = w.sq / w.n + v.aux_heat_kw;
    const span_s = (w.last_ms - w.t0_ms) / 1000;
    const storage_kw = (C_kj_k * (edgeTemperature(end, false) - edgeTemperature(end, true))) / span_s;
    const steady = Math.abs(storage_kw) <= o.max_storage_share * qGen;
    // A 1 °C grid makes T_in − T_out (5–10 K) too coarse for the coolant-side balance (common
    // practice: SPN 110 is not for ΔT); such windows take the heat balance instead.
    let meter: number | null = null;
    if (w.nFlow === w.n && !w.coarse) {
      const T = w.sTmean / w.n;
      // ρ·cp·V̇·ΔT: lpm → m³/s is /60 000; W → kW is /1000.
      meter =
        (glycolDensity_kg_m3(T, v.coolant_glycol_pct) * glycolCp_j_kgk(T, v.coolant_glycol_pct) * w.sFlowDt) /
        w.n /
        60_000 /
        1000;
    } else if (!steady) {
      res.rejected.not_steady++;
      return;
    }
    const qRej = meter ?? qGen - storage_kw;
    if (!(qRej >= minHeat_kw)) {
      res.rejected.low_heat++;
      return;
    }
    const e = res.evidence;
    e.speed_kmh.push(round(Math.sqrt(w.sItdV2 / w.sItd), 1));
    e.fan_pct.push(round(Math.sqrt(w.sItdF2 / w.sItd), 1));
    e.itd_k.push(round(w.sItd / w.n, 2));
    e.balance_kw.push(steady ? round(qGen - v.aux_heat_kw - storage_kw, 3) : null);
    e.meter_kw.push(meter === null ? null : round(meter, 3));
    e.flow_lpm.push(meter === null ? null : round(w.sFlow / w.n, 2));
    res.samples += w.n;
    if (w.nOut === w.n) out.dt_per_kw.push(w.sDt / w.n / qRej);
  };

  const maxStep_ms = o.max_step_s * 1000;
  const window_ms = o.window_s * 1000;
  const lag_ms = v.coolant_sensor_lag_s * 1000;
  let qLag = Number.NaN;
  const gate = new FullOpenGate(v, o, startOpen);
  for (let i = from; i < to; i++) {
    const t = c.time_ms[i]!;
    const q = heatToCoolant_kw(c.power_kw[i]!, v.drivetrain_efficiency, v.coolant_heat_fraction);
    qLag =
      i === from || lag_ms === 0 ? q : qLag + (q - qLag) * (1 - Math.exp(-(t - c.time_ms[i - 1]!) / lag_ms));
    const Tin = c.coolant_in_c[i]!;
    const itd = Tin - c.ambient_c[i]!;
    const speed = c.speed_kmh[i]!;
    const fan = c.fan_pct[i]!;
    const warm = Tin >= v.thermostat_open_c && itd >= o.min_itd_k;
    const inCharge = gate.inCharge(Tin, itd) && warm;
    const band = inCharge ? bandOf(speed, fan) : null;
    if (band !== null) out[band].eligible++;
    else if (warm) {
      const held = bandOf(speed, fan);
      if (held !== null) out[held].held_c.push(Tin);
    }
    if (w.band !== null && (band !== w.band || t - w.last_ms > maxStep_ms || t - w.t0_ms >= window_ms))
      close(i);
    if (band === null) continue;
    if (w.band === null) w.start(band, t, i);
    w.n++;
    w.sq += qLag;
    w.sItd += itd;
    w.sItdV2 += itd * speed * speed;
    w.sItdF2 += itd * fan * fan;
    w.last_ms = t;
    const Tout = c.coolant_out_c[i]!;
    if (w.coarse && (Tin !== Math.round(Tin) || Tout !== Math.round(Tout))) w.coarse = false;
    if (!Number.isNaN(Tout)) {
      w.nOut++;
      w.sDt += Tin - Tout;
      const flow = c.coolant_flow_lpm[i]!;
      if (!Number.isNaN(flow)) {
        w.nFlow++;
        w.sFlowDt += flow * (Tin - Tout);
        w.sFlow += flow;
        w.sTmean += (Tin + Tout) / 2;
      }
    }
  }
  close(to);
  return out;
}
