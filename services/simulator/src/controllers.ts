/**
 * The vehicle's own thermal controllers, acting on the true coolant temperature (telemetry sensor faults
 * do not fool them).
 */

/**
 * –: share of the pump flow the thermostat passes to the radiator, 0 below `open_c`, rising linearly to
 * 1 at `full_open_c` (a wax element's lift is close to linear in temperature; from memory).
 * Example: open 52, full 58, at 55 °C → 0.5.
 */
export function thermostatOpening(t_c: number, open_c: number, full_open_c: number): number {
  if (t_c <= open_c) return 0;
  if (t_c >= full_open_c) return 1;
  return (t_c - open_c) / (full_open_c - open_c);
}

export interface FanControl {
  /** °C: duty 0 % here, rising linearly … */
  fan_start_c: number;
  /** °C: … to 100 % here. */
  fan_full_c: number;
  /** %: floor while the A/C condenser needs air: ambient above AC_DEMAND_AMBIENT_C at low speed. */
  fan_ac_min_pct: number;
}

/** °C / km/h: the A/C condenser asks for the fan above this ambient and below this speed (common practice). */
export const AC_DEMAND_AMBIENT_C = 28;
export const AC_DEMAND_MAX_SPEED_KMH = 20;

/**
 * %: fan duty, a linear ramp with coolant temperature (proportional control), floored by the condenser's
 * demand. Example: start 62, full 74, at 68 °C, fast → 50 %.
 */
export function fanDuty_pct(f: FanControl, coolant_c: number, speed_kmh: number, ambient_c: number): number {
  const ramp = Math.min(
    100,
    Math.max(0, (100 * (coolant_c - f.fan_start_c)) / (f.fan_full_c - f.fan_start_c)),
  );
  const ac = ambient_c > AC_DEMAND_AMBIENT_C && speed_kmh < AC_DEMAND_MAX_SPEED_KMH ? f.fan_ac_min_pct : 0;
  return Math.max(ramp, ac);
}

/**
 * Derate with hysteresis: on at or above the coolant limit, off again once the loop is `release_k` below
 * it (so the power limit does not chatter). Returns the new state.
 */
export function nextDerate(derated: boolean, coolant_c: number, limit_c: number, release_k: number): boolean {
  if (coolant_c >= limit_c) return true;
  if (coolant_c < limit_c - release_k) return false;
  return derated;
}
