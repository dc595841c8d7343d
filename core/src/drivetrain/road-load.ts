/**
 * Road load: the power at the wheels to hold a speed, climb a grade and accelerate.
 * Source: the standard road-load equation (Gillespie, *Fundamentals of Vehicle Dynamics*, SAE 1992,
 * ch. 4): P = v·(½ρ·CdA·v² + m·g·Crr·cos θ + m·g·sin θ + m·a), θ = atan(grade). Still air, no
 * rotating-inertia factor (include it in `mass_kg` if wanted).
 */

/** m/s²: standard gravity (CGPM 1901; also U.S. Standard Atmosphere 1976 g0). */
export const G_MS2 = 9.80665;

export interface RoadLoadInput {
  /** kg: vehicle mass as driven. */
  mass_kg: number;
  /** m²: drag coefficient × frontal area. */
  cda_m2: number;
  /** –: rolling-resistance coefficient. */
  crr: number;
  /** km/h: road speed, ≥ 0. */
  speed_kmh: number;
  /** %: road grade, rise/run × 100; negative downhill. Default 0. */
  grade_pct?: number;
  /** m/s²: longitudinal acceleration; negative when braking. Default 0. */
  accel_ms2?: number;
  /** kg/m³: air density. Default 1.2 (about 20 °C at sea level). */
  air_density_kg_m3?: number;
}

/** Each term's power in kW at the wheels; `wheel_kw` is their sum (negative when braking or downhill). */
export interface RoadLoad {
  aero_kw: number;
  rolling_kw: number;
  grade_kw: number;
  inertia_kw: number;
  wheel_kw: number;
}

/** Defaults of the optional `RoadLoadInput` fields. */
export const ROAD_LOAD_DEFAULTS = Object.freeze({ grade_pct: 0, accel_ms2: 0, air_density_kg_m3: 1.2 });

function check(ok: boolean, rule: string, got: number): void {
  if (!ok) throw new RangeError(`roadLoad: ${rule}, got ${got}`);
}

/**
 * Road-load power terms in kW (Gillespie 1992, ch. 4).
 * Example: 1500 kg, CdA 0.66 m², Crr 0.010, 100 km/h, ρ 1.225 → aero 8.664 kW, rolling 4.086 kW.
 */
export function roadLoad(p: RoadLoadInput): RoadLoad {
  const grade_pct = p.grade_pct ?? ROAD_LOAD_DEFAULTS.grade_pct;
  const accel_ms2 = p.accel_ms2 ?? ROAD_LOAD_DEFAULTS.accel_ms2;
  const air_density_kg_m3 = p.air_density_kg_m3 ?? ROAD_LOAD_DEFAULTS.air_density_kg_m3;
  check(p.mass_kg > 0, 'mass_kg must be > 0', p.mass_kg);
  check(p.cda_m2 >= 0, 'cda_m2 must be ≥ 0', p.cda_m2);
  check(p.crr >= 0, 'crr must be ≥ 0', p.crr);
  check(p.speed_kmh >= 0 && Number.isFinite(p.speed_kmh), 'speed_kmh must be finite and ≥ 0', p.speed_kmh);
  check(Number.isFinite(grade_pct), 'grade_pct must be finite', grade_pct);
  check(Number.isFinite(accel_ms2), 'accel_ms2 must be finite', accel_ms2);
  check(air_density_kg_m3 > 0, 'air_density_kg_m3 must be > 0', air_density_kg_m3);

  const v = p.speed_kmh / 3.6;
  const theta = Math.atan(grade_pct / 100);
  const weight_n = p.mass_kg * G_MS2;
  const aero_kw = (0.5 * air_density_kg_m3 * p.cda_m2 * v ** 3) / 1000;
  const rolling_kw = (weight_n * p.crr * Math.cos(theta) * v) / 1000;
  const grade_kw = (weight_n * Math.sin(theta) * v) / 1000;
  const inertia_kw = (p.mass_kg * accel_ms2 * v) / 1000;
  return {
    aero_kw,
    rolling_kw,
    grade_kw,
    inertia_kw,
    wheel_kw: aero_kw + rolling_kw + grade_kw + inertia_kw,
  };
}
