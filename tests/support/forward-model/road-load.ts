/**
 * Shaft power from a simple longitudinal road load (own implementation; Gillespie, *Fundamentals of
 * Vehicle Dynamics*, SAE 1992, ch. 4):
 * F = m·a·(1 + rotating share) + ½·ρ·CdA·v² + m·g·Crr + m·g·grade (small-angle grade).
 * Shaft power is wheel power over the driveline efficiency when driving; when braking an electric
 * drive recovers a share of it (negative power), a combustion engine reports none.
 */
export interface Body {
  mass_kg: number;
  cda_m2: number;
  crr: number;
  /** –: wheel power / shaft power when driving. */
  driveline_efficiency: number;
  /** –: share of braking wheel power returned as negative shaft power (0 for an engine). */
  regen_share: number;
  /** kW: most the drivetrain delivers. */
  rated_power_kw: number;
}

const G_M_S2 = 9.80665;
/** –: rotating-mass allowance on the vehicle's inertia (common practice 3–10 %). */
const ROTATING_SHARE = 0.05;

/** kW at the shaft, before any derate, clipped to the rated power. Example: see road-load checks. */
export function shaftPower_kw(
  b: Body,
  speed_ms: number,
  accel_ms2: number,
  grade: number,
  air_kg_m3: number,
): number {
  const force_n =
    b.mass_kg * accel_ms2 * (1 + ROTATING_SHARE) +
    0.5 * air_kg_m3 * b.cda_m2 * speed_ms * speed_ms +
    (speed_ms > 0.05 ? b.mass_kg * G_M_S2 * (b.crr + grade) : 0);
  const wheel_kw = (force_n * speed_ms) / 1000;
  const shaft_kw = wheel_kw >= 0 ? wheel_kw / b.driveline_efficiency : wheel_kw * b.regen_share;
  return Math.min(b.rated_power_kw, shaft_kw);
}
