import { bandFactor, faceVelocity_ms } from '../radiator/airside.ts';
import { BANDS, type Band, bandOf } from '../trip/bands.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';

/** W/(m²·K) per band, each referred to its band's reference condition (as trip results give them). */
export type BandK = Record<Band, number | null>;

/**
 * kA (W/K) of one radiator at any air condition from its band k: k_ref · (v_face / v_face,ref)^n · A
 * (the air-side model, radiator/airside.ts). The band standing for a condition is the band it lies in,
 * else the band whose reference face velocity is nearest on a log scale (the rule of designBand), else
 * whichever band has a k. Returns null when neither band has one.
 * Example: k_ram 1000, 2 m², defaults, 40 km/h fan 0 → 1000·(0.5)^0.5·2 = 1414 W/K.
 */
export function fieldKaModel(
  v: VehicleModel,
): (k: BandK, speed_kmh: number, fan_pct: number) => number | null {
  const a = v.airside;
  const vRef = {
    ram: faceVelocity_ms(BANDS.ram.reference.speed_kmh, BANDS.ram.reference.fan_pct, a),
    fan: faceVelocity_ms(BANDS.fan.reference.speed_kmh, BANDS.fan.reference.fan_pct, a),
  };
  const lnRam = Math.log(vRef.ram);
  const lnFan = Math.log(vRef.fan);
  return (k, speed_kmh, fan_pct) => {
    const vFace = faceVelocity_ms(speed_kmh, fan_pct, a);
    const lv = Math.log(vFace);
    let band: Band =
      bandOf(speed_kmh, fan_pct) ?? (Math.abs(lv - lnRam) <= Math.abs(lv - lnFan) ? 'ram' : 'fan');
    if (k[band] === null) band = band === 'ram' ? 'fan' : 'ram';
    const kRef = k[band];
    if (kRef === null) return null;
    return kRef * bandFactor(a, band, speed_kmh, fan_pct) * v.radiator_area_m2;
  };
}
