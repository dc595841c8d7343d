/**
 * One trip's true course, 1 Hz, as the physics computed it (before any sensor): what tests check the
 * energy balance and the fault effects on, and what the sensor layer turns into telemetry.
 * Sample i holds the state at t0 + i s; the loop temperature steps as
 *   T[i+1] = T[i] + (heat_kw[i] − rejected_kw[i]) · 1 s / C.
 */
export interface TripTruth {
  n: number;
  t0_ms: number;
  speed_kmh: Float64Array;
  power_kw: Float64Array;
  /** kW into the coolant (core's heatToCoolant_kw of power_kw). */
  heat_kw: Float64Array;
  /** kW the radiator gave to the air. */
  rejected_kw: Float64Array;
  /** °C: loop temperature = radiator inlet. */
  coolant_c: Float64Array;
  /** °C: radiator outlet. */
  out_c: Float64Array;
  ambient_c: Float64Array;
  /** %: commanded fan duty (what the fan_pct signal reports, whatever the fan actually delivers). */
  fan_pct: Float64Array;
  /** lpm through the radiator. */
  flow_lpm: Float64Array;
  derate: Uint8Array;
  /** W/(m²·K): Q/(A·ITD) the radiator actually achieved (NaN when the thermostat was closed). */
  k_w_m2k: Float64Array;
}

export function emptyTruth(n: number, t0_ms: number): TripTruth {
  return {
    n,
    t0_ms,
    speed_kmh: new Float64Array(n),
    power_kw: new Float64Array(n),
    heat_kw: new Float64Array(n),
    rejected_kw: new Float64Array(n),
    coolant_c: new Float64Array(n),
    out_c: new Float64Array(n),
    ambient_c: new Float64Array(n),
    fan_pct: new Float64Array(n),
    flow_lpm: new Float64Array(n),
    derate: new Uint8Array(n),
    k_w_m2k: new Float64Array(n),
  };
}
