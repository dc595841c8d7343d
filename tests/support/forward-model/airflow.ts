/**
 * Face velocity of the cooling air from a pressure balance across the module (own model, not the
 * core's shortcut): ram pressure ½ρ·c_ram·V² plus fan pressure equal the module loss ½ρ·K·v².
 * The fan curve is quadratic in face velocity with a linear term, Δp_fan ∝ a·n² − g·n·v − b·v²
 * (a common fan-curve shape; affinity laws Q ∝ n, Δp ∝ n² hold at g = 0). Dividing by the loss gives
 *   v² + g·n·v − (r²·V² + a·n²) = 0,   a = v_fan² + g·v_fan,
 * so that v = r·V with the fan off and v = n·v_fan standing still, exactly the fleet file's two
 * `airside` figures; in between (ram and fan together) v falls below the core's √(ram² + fan²) by an
 * amount set by the fan-curve slope g.
 */
export interface Airflow {
  /** –: face velocity / vehicle speed with the fan off. */
  ram_face_ratio: number;
  /** m/s: face velocity at 100 % fan, standing still. */
  fan_face_velocity_ms: number;
  /** m/s: fan-curve slope term g (0 = pure affinity-law quadrature). */
  fan_curve_slope_ms: number;
}

/** m/s of face velocity at a vehicle speed and fan duty. Example: r 0.25, 4 m/s, g 2, 20 km/h, 100 % → 4.19. */
export function airFaceVelocity_ms(a: Airflow, speed_kmh: number, fan_pct: number): number {
  const n = Math.max(0, fan_pct) / 100;
  const ram = (a.ram_face_ratio * Math.max(0, speed_kmh)) / 3.6;
  const g = a.fan_curve_slope_ms;
  const aFan = a.fan_face_velocity_ms ** 2 + g * a.fan_face_velocity_ms;
  const gn = g * n;
  return (-gn + Math.sqrt(gn * gn + 4 * (ram * ram + aFan * n * n))) / 2;
}
