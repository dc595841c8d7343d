import type { SampleColumns } from '@thermargin/shared';
import { heatToCoolant_kw } from '../drivetrain/heat.ts';
import { glycolCp_j_kgk, glycolDensity_kg_m3 } from '../properties/glycol.ts';
import { faceVelocity_ms } from '../radiator/airside.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { BANDS, type Band, bandOf } from './bands.ts';
import type { EstimatorOptions } from './estimator-options.ts';

/** What the windows of one band gave on one trip. */
export interface BandWindows {
  /** W/(m²·K) of each accepted window, referred to the band's reference condition. */
  k_w_m2k: number[];
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
  return { k_w_m2k: [], samples: 0, eligible: 0, rejected: { short: 0, low_heat: 0, not_steady: 0 } };
}

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
  sgItd = 0;
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
    this.n = this.st = this.stt = this.sT = this.stT = this.sq = this.sgItd = 0;
    this.nFlow = this.sFlowDt = this.nOut = this.sDt = this.sTmean = 0;
    this.coarse = true;
  }
}

/**
 * Radiator-in-charge windows of one trip (docs/methods.md §4: Q = k·A·ITD, heat rejected = heat
 * generated − C·dT/dt, or ρ·cp·V̇·(T_in − T_out) with a flow meter). Per window of ≤ window_s:
 *   k_ref = Q̄_rejected / (A · mean(g·ITD)),  g = (v_face / v_face,ref)^n
 * which is exact when k = k_ref·g within the window (airside.ts), so every window's k is referred to
 * its band's reference condition. dT/dt is the least-squares slope of coolant_in_c over the window,
 * a noise-robust derivative; for a quadratic temperature course it equals the window's mean derivative.
 * Sensor lag: a first-order sensor of time constant τ reads T_m with τ·dT_m/dt = T − T_m. Passing the
 * heat generated through the same lag gives L[q] − C·dT_m/dt = kA·(T_m − T_amb) exactly for constant
 * kA, so heat and measured temperature stay aligned in fast stop-and-go.
 */
export function tripWindows(
  c: SampleColumns,
  from: number,
  to: number,
  v: VehicleModel,
  o: EstimatorOptions,
): TripWindows {
  const out: TripWindows = { ram: emptyBand(), fan: emptyBand(), dt_per_kw: [] };
  const a = v.airside;
  const vRef = {
    ram: faceVelocity_ms(BANDS.ram.reference.speed_kmh, BANDS.ram.reference.fan_pct, a),
    fan: faceVelocity_ms(BANDS.fan.reference.speed_kmh, BANDS.fan.reference.fan_pct, a),
  };
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
    const qGen = w.sq / w.n;
    let qRej: number;
    // A 1 °C grid makes T_in − T_out (5–10 K) too coarse for the coolant-side balance (common
    // practice: SPN 110 is not for ΔT); such windows take the heat balance instead.
    if (w.nFlow === w.n && !w.coarse) {
      const T = w.sTmean / w.n;
      // ρ·cp·V̇·ΔT: lpm → m³/s is /60 000; W → kW is /1000.
      qRej =
        (glycolDensity_kg_m3(T, v.coolant_glycol_pct) * glycolCp_j_kgk(T, v.coolant_glycol_pct) * w.sFlowDt) /
        w.n /
        60_000 /
        1000;
    } else {
      const den = w.n * w.stt - w.st * w.st;
      const slope_k_s = den > 0 ? (w.n * w.stT - w.st * w.sT) / den : 0;
      const storage_kw = C_kj_k * slope_k_s;
      if (Math.abs(storage_kw) > o.max_storage_share * qGen) {
        res.rejected.not_steady++;
        return;
      }
      qRej = qGen - storage_kw;
    }
    if (!(qRej >= minHeat_kw)) {
      res.rejected.low_heat++;
      return;
    }
    res.k_w_m2k.push((qRej * 1000) / (v.radiator_area_m2 * (w.sgItd / w.n)));
    res.samples += w.n;
    if (w.nOut === w.n) out.dt_per_kw.push(w.sDt / w.n / qRej);
  };

  const maxStep_ms = o.max_step_s * 1000;
  const window_ms = o.window_s * 1000;
  const n = a.velocity_exponent;
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
    w.sgItd += (faceVelocity_ms(speed, fan, a) / vRef[band]) ** n * itd;
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
