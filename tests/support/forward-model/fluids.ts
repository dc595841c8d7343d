/**
 * Fluid properties the forward model needs, kept apart from the core's own implementations.
 * - Coolant: 50 vol % ethylene glycol (mass fraction 0.527), linear interpolation of the tabulated
 *   Melinder (2010) values (the polynomial's outputs at 52.7 wt %, computed); the table's curvature keeps
 *   the interpolation within 0.1 % of the polynomial.
 * - Air: ideal gas at 101 325 Pa, R = 287.05 J/(kg·K) (U.S. Standard Atmosphere 1976); cp 1007 J/(kg·K)
 *   (Incropera Table A.4 at 300 K, from memory; 1005–1007 over 250–350 K).
 */

/** vol %: the only concentration the table below describes; vehicles must use it. */
export const COOLANT_GLYCOL_VOL_PCT = 50;

const T_C = [20, 40, 60, 80, 100];
const RHO_KG_M3 = [1068.3, 1056.6, 1043.4, 1029.2, 1014.3];
const CP_J_KGK = [3255, 3361, 3456, 3538, 3604];

function interpolate(ys: readonly number[], t_c: number): number {
  const t = Math.min(T_C[T_C.length - 1]!, Math.max(T_C[0]!, t_c));
  const i = Math.min(T_C.length - 2, Math.floor((t - T_C[0]!) / 20));
  const f = (t - T_C[i]!) / 20;
  return ys[i]! + f * (ys[i + 1]! - ys[i]!);
}

/** J/(m³·K): volumetric heat capacity ρ·cp of the coolant at `t_c`. Example: 80 °C → 3.6413e6. */
export function coolantRhoCp_j_m3k(t_c: number): number {
  return interpolate(RHO_KG_M3, t_c) * interpolate(CP_J_KGK, t_c);
}

export const AIR_CP_J_KGK = 1007;

/** kg/m³ of dry air at `t_c` and sea-level pressure. Example: 40 °C → 1.1272. */
export function airDensity_kg_m3(t_c: number): number {
  return 101_325 / (287.05 * (t_c + 273.15));
}
