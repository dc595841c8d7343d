/**
 * Air-side model: how the core's face velocity follows vehicle speed and fan duty, and how k scales
 * with it. Used to compare like with like: every band k is referred to its band's reference condition.
 *
 * - Ram air: face velocity = ram_face_ratio · vehicle speed (grille blockage and module losses make it a
 *   fraction of road speed).
 * - Fan: face velocity ∝ fan speed (fan affinity law Q ∝ n; duty taken as a fraction of full speed).
 * - Combined: ram dynamic pressure and fan pressure both go as velocity², and the module's loss as
 *   face velocity², so v_face = √(v_ram² + v_fan²).
 * - k ∝ v_face^n, n = 0.4–0.8 for radiators (common practice; Davenport-type louvred-fin j-factors give
 *   ≈ 0.5–0.6, from memory).
 */
export interface Airside {
  /** –: face velocity / vehicle speed under ram air. Default 0.25 (from memory: 3–8 m/s at highway speed). */
  ram_face_ratio: number;
  /** m/s: face velocity at 100 % fan, standing still. Default 4.0 (from memory: 1.5–4 m/s at idle). */
  fan_face_velocity_ms: number;
  /** –: exponent n in k ∝ v_face^n. Default 0.5 (common practice 0.4–0.8). */
  velocity_exponent: number;
  /**
   * –: the exponent in the fan band, when learned apart (the vehicle stage): k follows face velocity
   * more steeply at the fan band's lower velocities (at low air flow ε → 1 and Q/ITD → ṁ_air·cp, so
   * n → 1). Absent: velocity_exponent.
   */
  fan_velocity_exponent?: number;
}

/** The exponent that refers k within `band` and moves k from that band's reference. */
export function bandExponent(a: Airside, band: 'ram' | 'fan'): number {
  return band === 'fan' ? (a.fan_velocity_exponent ?? a.velocity_exponent) : a.velocity_exponent;
}

export const AIRSIDE_DEFAULTS: Readonly<Airside> = Object.freeze({
  ram_face_ratio: 0.25,
  fan_face_velocity_ms: 4.0,
  velocity_exponent: 0.5,
});

/** Operating condition that fixes the air flow. */
export interface AirCondition {
  speed_kmh: number;
  fan_pct: number;
}

/** The reference conditions each band's k is referred to. */
export const RAM_REFERENCE: Readonly<AirCondition> = Object.freeze({ speed_kmh: 80, fan_pct: 0 });
export const FAN_REFERENCE: Readonly<AirCondition> = Object.freeze({ speed_kmh: 0, fan_pct: 100 });

/** m/s face velocity. Example: 80 km/h, fan 0 %, defaults → 5.556 m/s. */
export function faceVelocity_ms(speed_kmh: number, fan_pct: number, a: Airside): number {
  const ram = (a.ram_face_ratio * speed_kmh) / 3.6;
  const fan = (a.fan_face_velocity_ms * fan_pct) / 100;
  return Math.sqrt(ram * ram + fan * fan);
}

/**
 * –: k at (speed, fan) over k at `band`'s reference condition, (v_face / v_face,ref)^n with the band's
 * exponent. Example: defaults, ram band, 40 km/h fan 0 → (0.5)^0.5 = 0.7071.
 */
export function bandFactor(a: Airside, band: 'ram' | 'fan', speed_kmh: number, fan_pct: number): number {
  const ref = band === 'ram' ? RAM_REFERENCE : FAN_REFERENCE;
  const vRef = faceVelocity_ms(ref.speed_kmh, ref.fan_pct, a);
  return (faceVelocity_ms(speed_kmh, fan_pct, a) / vRef) ** bandExponent(a, band);
}

/**
 * Factor that refers a k measured at `from` to the condition `to`: (v_to / v_from)^n.
 * Example: defaults, from fan 80 % standing to fan 100 % → (4/3.2)^0.5 = 1.1180.
 */
export function kReferenceFactor(from: AirCondition, to: AirCondition, a: Airside): number {
  const vFrom = faceVelocity_ms(from.speed_kmh, from.fan_pct, a);
  const vTo = faceVelocity_ms(to.speed_kmh, to.fan_pct, a);
  return (vTo / vFrom) ** a.velocity_exponent;
}
