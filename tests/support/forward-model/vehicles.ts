import type { RadiatorCore } from './radiator.ts';
import type { VehicleSpec } from './vehicle-spec.ts';

/**
 * Three invented vehicles with plausible figures (docs/methods.md §2–3: road load as in Gillespie 1992;
 * k of frontal area 2–6 kW/(m²·K) at 4–7 m/s, computed as ε_air·ρ·cp·v with ε_air 0.4–0.7; design heat
 * 20–150 kW; the van's loop is smaller, 8 kW). Each is tuned so that on a hot day the radiator
 * is in charge in both bands for a good share of a mixed trip.
 */

/** Typed before freezing, so literal unions (pump kind) are checked against VehicleSpec. */
function frozen(v: VehicleSpec): Readonly<VehicleSpec> {
  return Object.freeze(v);
}

/** A louvred-fin core, per m² of frontal area (own figures, k ≈ 3–4 kW/(m²·K) at 5 m/s). */
function louvredCore(
  area_m2: number,
  coolant_ref_lpm: number,
  over: Partial<RadiatorCore> = {},
): RadiatorCore {
  return {
    area_m2,
    air_ref_velocity_ms: 5,
    air_conductance_ref_w_m2k: 9000,
    air_h_exponent: 0.58,
    fin_ml_ref: 0.8,
    fin_area_share: 0.85,
    coolant_conductance_ref_w_m2k: 25_000,
    coolant_ref_lpm,
    ...over,
  };
}

export const FUEL_CELL_BUS: Readonly<VehicleSpec> = frozen({
  id: 'fc-bus-01',
  powertrain: 'fcev',
  drivetrain_efficiency: 0.5,
  coolant_heat_fraction: 0.45,
  body: {
    mass_kg: 18_000,
    cda_m2: 5.0,
    crr: 0.007,
    driveline_efficiency: 0.92,
    regen_share: 0.6,
    rated_power_kw: 200,
  },
  core: louvredCore(0.9, 300),
  airflow: { ram_face_ratio: 0.22, fan_face_velocity_ms: 2.8, fan_curve_slope_ms: 1.5 },
  thermal_mass_kj_per_k: 320,
  thermostat: { open_c: 58, full_open_c: 64, leak_share: 0.03 },
  fan: { on_c: 72, full_c: 75, min_pct: 30, hysteresis_k: 3, slew_pct_s: 20 },
  pump: { kind: 'electric', flow_lpm: 300 },
  coolant_limit_c: 80,
  derate: { span_k: 5, floor_share: 0.5 },
  design: { ambient_c: 40, heat_kw: 80, speed_kmh: 20, fan_pct: 100 },
  sensor_lag_s: 2,
});

export const ELECTRIC_VAN: Readonly<VehicleSpec> = frozen({
  id: 'ev-van-01',
  powertrain: 'bev',
  drivetrain_efficiency: 0.82,
  coolant_heat_fraction: 0.2,
  body: {
    mass_kg: 4200,
    cda_m2: 1.7,
    crr: 0.009,
    driveline_efficiency: 0.95,
    regen_share: 0.7,
    rated_power_kw: 150,
  },
  core: louvredCore(0.14, 60, {
    air_conductance_ref_w_m2k: 8000,
    air_h_exponent: 0.55,
    coolant_conductance_ref_w_m2k: 20_000,
  }),
  airflow: { ram_face_ratio: 0.22, fan_face_velocity_ms: 2.2, fan_curve_slope_ms: 1.0 },
  thermal_mass_kj_per_k: 40,
  thermostat: { open_c: 48, full_open_c: 54, leak_share: 0.05 },
  fan: { on_c: 60, full_c: 62, min_pct: 30, hysteresis_k: 2, slew_pct_s: 25 },
  pump: { kind: 'electric', flow_lpm: 50 },
  coolant_limit_c: 68,
  derate: { span_k: 4, floor_share: 0.4 },
  design: { ambient_c: 35, heat_kw: 8, speed_kmh: 20, fan_pct: 100 },
  sensor_lag_s: 2,
});

export const DIESEL_TRUCK: Readonly<VehicleSpec> = frozen({
  id: 'dx-truck-01',
  powertrain: 'ice',
  drivetrain_efficiency: 0.42,
  coolant_heat_fraction: 1 / 3,
  body: {
    mass_kg: 40_000,
    cda_m2: 6.0,
    crr: 0.0065,
    driveline_efficiency: 0.93,
    regen_share: 0,
    rated_power_kw: 330,
  },
  core: louvredCore(0.75, 400, {
    air_conductance_ref_w_m2k: 10_000,
    air_h_exponent: 0.6,
    coolant_conductance_ref_w_m2k: 30_000,
  }),
  airflow: { ram_face_ratio: 0.2, fan_face_velocity_ms: 4.5, fan_curve_slope_ms: 2.5 },
  thermal_mass_kj_per_k: 350,
  thermostat: { open_c: 78, full_open_c: 86, leak_share: 0.02 },
  fan: { on_c: 97, full_c: 100, min_pct: 30, hysteresis_k: 3, slew_pct_s: 15 },
  pump: { kind: 'engine', flow_at_rated_lpm: 450, idle_rpm: 600, rated_rpm: 1800 },
  coolant_limit_c: 105,
  derate: { span_k: 5, floor_share: 0.5 },
  design: { ambient_c: 40, heat_kw: 130, speed_kmh: 20, fan_pct: 100 },
  sensor_lag_s: 2,
});

export const VEHICLES: readonly Readonly<VehicleSpec>[] = [FUEL_CELL_BUS, ELECTRIC_VAN, DIESEL_TRUCK];
