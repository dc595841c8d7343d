/**
 * Dry air as an ideal gas, for air-side bounds and road-load drag.
 * Source: U.S. Standard Atmosphere 1976 (R = R* / M0 = 8.31432 / 0.0289644 = 287.053 J/(kg·K);
 * sea level 101325 Pa, 288.15 K, ρ0 = 1.225 kg/m³).
 */

/** J/(kg·K): specific gas constant of dry air (U.S. Standard Atmosphere 1976, R* / M0 rounded). */
export const R_DRY_AIR_J_KGK = 287.05;

/**
 * J/(kg·K): specific heat of dry air at constant pressure, one value for 250–350 K (it varies
 * 1005–1007 there: 1005 in the standard-atmosphere tables, 1007 at 300 K in Incropera Table A.4).
 */
export const AIR_CP_J_KGK = 1006;

/** Pa: standard sea-level pressure (U.S. Standard Atmosphere 1976). */
export const STANDARD_PRESSURE_PA = 101325;

/**
 * kg/m³: ideal-gas density of dry air, ρ = p / (R·T), at `t_c` °C and `pressure_pa`.
 * Throws RangeError for a temperature at or below absolute zero or a pressure ≤ 0.
 * Example: 15 °C, 101325 Pa → 1.2250 kg/m³ (the standard-atmosphere sea-level value).
 */
export function dryAirDensity_kg_m3(t_c: number, pressure_pa = STANDARD_PRESSURE_PA): number {
  const t_k = t_c + 273.15;
  if (!(t_k > 0))
    throw new RangeError(`dryAirDensity_kg_m3: temperature must be above −273.15 °C, got ${t_c}`);
  if (!(pressure_pa > 0))
    throw new RangeError(`dryAirDensity_kg_m3: pressure_pa must be > 0, got ${pressure_pa}`);
  return pressure_pa / (R_DRY_AIR_J_KGK * t_k);
}
