import type { BandWindowsEvidence } from '@thermargin/shared';
import { type Airside, bandFactor } from '../radiator/airside.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import type { Band } from './bands.ts';

/**
 * What a window's k at its band's reference condition depends on beyond the window itself: the
 * air-side shape, the unmeasured steady heat and the ambient correction. The trip stage refers with
 * the fleet file's figures (or the defaults); the vehicle stage with what it learned from all trips.
 */
export interface Referral {
  airside: Airside;
  /** kW: steady heat into the loop that the traction power does not carry. */
  unmeasured_heat_kw: number;
  /** K added to the measured ambient (so the ITD loses it). */
  ambient_correction_k: number;
}

/** The referral before any learning: the fleet file's air side and unmeasured heat, no ambient correction. */
export function priorReferral(v: Pick<VehicleModel, 'airside' | 'aux_heat_kw'>): Referral {
  return { airside: v.airside, unmeasured_heat_kw: v.aux_heat_kw, ambient_correction_k: 0 };
}

/**
 * W/(m²·K): each window's k referred to the band's reference condition (the rating equation Q = k·A·ITD, common practice;
 * k ∝ v_face^n, airside.ts):
 *   k_ref = Q / (A · (ITD − correction) · (v_face / v_face,ref)^n)
 * with Q the flow meter's heat rejected, or else the heat balance plus the unmeasured heat. A window
 * whose corrected ITD or heat is not positive gives NaN.
 * Example: Q 30 kW, A 0.5 m², ITD 30 K, 80 km/h fan 0 in the ram band → 2000 W/(m²·K) for any shape.
 */
export function windowK_w_m2k(
  band: Band,
  e: BandWindowsEvidence,
  area_m2: number,
  r: Referral,
): Float64Array {
  const n = e.itd_k.length;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const q_kw = e.meter_kw[i] ?? (e.balance_kw[i] ?? Number.NaN) + r.unmeasured_heat_kw;
    const itd = e.itd_k[i]! - r.ambient_correction_k;
    const g = bandFactor(r.airside, band, e.speed_kmh[i]!, e.fan_pct[i]!);
    out[i] = q_kw > 0 && itd > 0 ? (q_kw * 1000) / (area_m2 * itd * g) : Number.NaN;
  }
  return out;
}
