import { bandFactor, faceVelocity_ms } from '../radiator/airside.ts';
import { limitingAmbient_c, marginPct } from '../radiator/rating.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { BANDS, type Band, bandOf } from './bands.ts';

/**
 * The band whose measurements stand for the design point: the band the design speed and fan put it
 * in, else the band whose reference face velocity is nearest on a log scale (k ∝ v^n is a power law,
 * so distance in log v is distance in k).
 */
export function designBand(v: VehicleModel): Band {
  const d = v.design;
  const inBand = bandOf(d.speed_kmh, d.fan_pct);
  if (inBand) return inBand;
  const vd = faceVelocity_ms(d.speed_kmh, d.fan_pct, v.airside);
  const dist = (b: Band) =>
    Math.abs(
      Math.log(vd / faceVelocity_ms(BANDS[b].reference.speed_kmh, BANDS[b].reference.fan_pct, v.airside)),
    );
  return dist('ram') <= dist('fan') ? 'ram' : 'fan';
}

/** W/K: kA at the design point from a band's reference k, moved along the air-side model. */
export function designKa_w_k(v: VehicleModel, band: Band, k_ref_w_m2k: number): number {
  return k_ref_w_m2k * bandFactor(v.airside, band, v.design.speed_kmh, v.design.fan_pct) * v.radiator_area_m2;
}

export interface DesignMargin {
  margin_pct: number | null;
  limiting_ambient_c: number | null;
  basis: Band | null;
}

/**
 * Margin and limiting ambient temperature at the design point (radiator/rating.ts; LAT as in SAE J1393), from
 * the design band's k, or from the other band's when the design band had no estimate.
 */
export function designMargin(v: VehicleModel, k: Record<Band, number | null>): DesignMargin {
  const first = designBand(v);
  const basis =
    k[first] !== null
      ? first
      : k[first === 'ram' ? 'fan' : 'ram'] !== null
        ? first === 'ram'
          ? 'fan'
          : 'ram'
        : null;
  if (basis === null) return { margin_pct: null, limiting_ambient_c: null, basis: null };
  const ka = designKa_w_k(v, basis, k[basis]!);
  return {
    margin_pct: marginPct(ka, v.coolant_limit_c, v.design.ambient_c, v.design.heat_kw),
    limiting_ambient_c: limitingAmbient_c(ka, v.coolant_limit_c, v.design.heat_kw),
    basis,
  };
}
