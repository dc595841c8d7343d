import type { BandWindowsEvidence, SampleColumns } from '@thermargin/shared';
import { heatToCoolant_kw } from '../drivetrain/heat.ts';
import { glycolCp_j_kgk, glycolDensity_kg_m3 } from '../properties/glycol.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { type Band, bandOf } from './bands.ts';
import type { EstimatorOptions } from './estimator-options.ts';

/** What the windows of one band gave on one trip. */
export interface BandWindows {
  /** What each accepted window is made of (the trip result carries it; refer.ts makes k of it). */
  evidence: BandWindowsEvidence;
  /** Samples in accepted windows. */
  samples: number;
  /** Samples that were in the band with the radiator in charge (before window rules). */
  eligible: number;
  /** Windows rejected, by rule. */
  rejected: { short: number; low_heat: number; not_steady: number };
}

export interface TripWindows {
  ram: BandWindows;
  fan: BandWindows;
  /** K/kW: radiator temperature drop per kW rejected, one per accepted window with an outlet sensor. */
  dt_per_kw: number[];
}

function emptyBand(): BandWindows {
  return {
    evidence: { speed_kmh: [], fan_pct: [], itd_k: [], balance_kw: [], meter_kw: [] },
    samples: 0,
    eligible: 0,
    rejected: { short: 0, low_heat: 0, not_steady: 0 },
  };
}

const round = (x: number, digits: number) => {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};

/** Running sums of one window; times in seconds from the window's first sample. */
class WindowSums {
  band: Band | null = null;
  t0_ms = 0;
  last_ms = 0;
  n = 0;
  st = 0;
  stt = 0;
  sT = 0;
  stT = 0;
  sq = 0;
  sItd = 0;
  sItdV2 = 0;
  sItdF2 = 0;
  nFlow = 0;
  sFlowDt = 0;
  nOut = 0;
  sDt = 0;
  sTmean = 0;
  /** False once a coolant reading off a 1 °C grid is seen (SAE J1939 SPN 110 resolution). */
  coarse = true;

  start(band: Band, t_ms: number): void {
    this.band = band;
    this.t0_ms = t_ms;
    this.n = this.st = this.stt = this.sT = this.stT = this.sq = this.sItd = this.sItdV2 = this.sItdF2 = 0;
    this.nFlow = this.sFlowDt = this.nOut = this.sDt = this.sTmean = 0;
    this.coarse = true;
  }
}

/**
 * Radiator-in-charge windows of one trip (docs/methods.md §4: Q = k·A·ITD, heat rejected = heat generated
 * − C·dT/dt, or ρ·cp·V̇·(T_in − T_out) with a flow meter). Each accepted window of ≤ window_s keeps
 * its heat rejected, mean ITD and air condition (speed and fan duty as ITD-weighted root mean squares,
 * so the face velocity √(ram² + fan²) of airside.ts is exact at the window's mean square); refer.ts
 * makes its k at the band's reference condition from them. dT/dt is the least-squares slope of
 * coolant_in_c over the window, a noise-robust derivative; for a quadratic temperature course it equals
 * the window's mean derivative.
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
): TripWindows {
  const out: TripWindows = { ram: emptyBand(), fan: emptyBand(), dt_per_kw: [] };
  const C_kj_k = v.thermal_mass_kj_per_k;
  const minHeat_kw = Math.max(o.min_heat_kw, o.min_heat_share_of_design * v.design.heat_kw);
  const w = new WindowSums();

  const close = (): void => {
    const band = w.band;
    if (band === null) return;
    w.band = null;
    const res = out[band];
    if (w.n < 3 || (w.last_ms - w.t0_ms) / 1000 < o.min_window_s) {
      res.rejected.short++;
      return;
    }
    const qGen = w.sq / w.n + v.aux_heat_kw;
    const den = w.n * w.stt - w.st * w.st;
    const slope_k_s = den > 0 ? (w.n * w.stT - w.st * w.sT) / den : 0;
    const storage_kw = C_kj_k * slope_k_s;
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
    res.samples += w.n;
    if (w.nOut === w.n) out.dt_per_kw.push(w.sDt / w.n / qRej);
  };

  const maxStep_ms = o.max_step_s * 1000;
  const window_ms = o.window_s * 1000;
  const lag_ms = v.coolant_sensor_lag_s * 1000;
  let qLag = Number.NaN;
  for (let i = from; i < to; i++) {
    const t = c.time_ms[i]!;
    const q = heatToCoolant_kw(c.power_kw[i]!, v.drivetrain_efficiency, v.coolant_heat_fraction);
    qLag =
      i === from || lag_ms === 0 ? q : qLag + (q - qLag) * (1 - Math.exp(-(t - c.time_ms[i - 1]!) / lag_ms));
    const Tin = c.coolant_in_c[i]!;
    const itd = Tin - c.ambient_c[i]!;
    const speed = c.speed_kmh[i]!;
    const fan = c.fan_pct[i]!;
    const inCharge = Tin >= v.thermostat_full_open_c && itd >= o.min_itd_k;
    const band = inCharge ? bandOf(speed, fan) : null;
    if (band !== null) out[band].eligible++;
    if (w.band !== null && (band !== w.band || t - w.last_ms > maxStep_ms || t - w.t0_ms >= window_ms))
      close();
    if (band === null) continue;
    if (w.band === null) w.start(band, t);
    const ts = (t - w.t0_ms) / 1000;
    w.n++;
    w.st += ts;
    w.stt += ts * ts;
    w.sT += Tin;
    w.stT += ts * Tin;
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
        w.sTmean += (Tin + Tout) / 2;
      }
    }
  }
  close();
  return out;
}
