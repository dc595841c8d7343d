import type { Powertrain } from '@thermargin/shared';

/** A range drawn uniformly per vehicle, or a fixed value. */
export type Range = readonly [number, number] | number;

/** Which trips a vehicle type runs: segment patterns drawn per trip (see schedule.ts). */
export interface ServicePattern {
  /** Operating days per week (0 = Sunday … 6 = Saturday). */
  days_of_week: readonly number[];
  /** Trips per operating day (2–6 in the default fleet). */
  trips_per_day: readonly [number, number];
  /** h local: first departure. */
  first_departure_h: readonly [number, number];
  /** min: trip length. */
  trip_min: readonly [number, number];
  /** min: pause between trips. */
  pause_min: readonly [number, number];
  /** km/h: urban cruise, highway cruise, climbing speed. */
  urban_kmh: number;
  highway_kmh: number;
  climb_kmh: number;
  /** %: steepest climb of the routes. */
  climb_grade_pct: readonly [number, number];
  /** Relative weights of the segment kinds within a trip. */
  mix: { urban: number; highway: number; grades: number; idle: number };
  /** kW: extra auxiliary load while idling (layover charging, A/C pre-cooling, power take-off). */
  idle_aux_kw: Range;
  /** min: idle segment length. */
  idle_min: readonly [number, number];
}

/**
 * One kind of vehicle in the invented fleet: the physical figures (round numbers of the right order,
 * common practice, not any real model) and how its controllers behave. The radiator itself follows from
 * the design point and a clean margin drawn from `margin` (see radiator.ts).
 */
export interface Archetype {
  key: 'bus' | 'van' | 'truck';
  type: string;
  powertrain: Powertrain;
  /** –: traction output / energy input (the core's powertrain presets: fcev ≈ 0.45, bev ≈ 0.80, ice 0.40). */
  drivetrain_efficiency: number;
  /** –: share of the energy input into the coolant, when not the core's default for the powertrain (the
   *  vans' loop also takes the battery chiller's heat through a water-cooled condenser). */
  coolant_heat_fraction?: number;
  mass_kg: Range;
  payload_kg: Range;
  cda_m2: number;
  crr: number;
  /** kW: traction power limit at the wheels. */
  rated_kw: number;
  /** –: share of braking power recovered (negative power_kw); 0 for a combustion engine. */
  regen_share: number;
  /** kW: most negative power (regeneration limit, or engine braking for ice). */
  min_power_kw: number;
  /** m/s²: the driver's hardest acceleration. */
  accel_ms2: number;
  /** kW: auxiliaries always on; plus kW per K of ambient above 22 °C for air conditioning. */
  aux_base_kw: number;
  aux_ac_kw_per_k: number;
  radiator_area_m2: Range;
  coolant_limit_c: Range;
  thermostat_open_c: number;
  thermostat_full_open_c: number;
  thermal_mass_kj_per_k: Range;
  coolant_glycol_pct: number;
  design: { ambient_c: number; heat_kw: Range; speed_kmh: number; fan_pct: number };
  /** –: clean margin at the design point, drawn per vehicle (+15…+40 %). */
  margin: Range;
  airside: { ram_face_ratio: number; fan_face_velocity_ms: number; velocity_exponent: number };
  /** lpm: coolant pump flow with the thermostat fully open. */
  pump_lpm: Range;
  /** °C: fan duty ramps linearly from 0 % at start_c to 100 % at full_c. */
  fan_start_c: number;
  fan_full_c: number;
  /** %: minimum fan duty at low speed on a warm day while the A/C condenser needs air (0 = no such demand). */
  fan_ac_min_pct: number;
  /** K below coolant_limit_c at which the derate is released; share of rated power allowed while derated. */
  derate_release_k: number;
  derate_power_share: number;
  /** h: time constant of the parked loop cooling to ambient. */
  soak_tau_h: number;
  route_max_ambient_c: number;
  duty: ServicePattern;
}

export const ARCHETYPES: Readonly<Record<Archetype['key'], Archetype>> = {
  bus: {
    key: 'bus',
    type: '12 m fuel-cell bus',
    powertrain: 'fcev',
    drivetrain_efficiency: 0.45,
    mass_kg: [13_500, 14_500],
    payload_kg: [500, 4_500],
    cda_m2: 5.2,
    crr: 0.0075,
    rated_kw: 180,
    regen_share: 0.6,
    min_power_kw: -120,
    accel_ms2: 0.9,
    aux_base_kw: 6,
    aux_ac_kw_per_k: 1.3,
    radiator_area_m2: [1.3, 1.5],
    coolant_limit_c: [80, 85],
    thermostat_open_c: 52,
    thermostat_full_open_c: 58,
    thermal_mass_kj_per_k: [360, 400],
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: [120, 140], speed_kmh: 20, fan_pct: 100 },
    margin: [0.2, 0.35],
    airside: { ram_face_ratio: 0.2, fan_face_velocity_ms: 4.5, velocity_exponent: 0.5 },
    pump_lpm: [280, 320],
    fan_start_c: 62,
    fan_full_c: 74,
    fan_ac_min_pct: 85,
    derate_release_k: 3,
    derate_power_share: 0.5,
    soak_tau_h: 2,
    route_max_ambient_c: 38,
    duty: {
      days_of_week: [0, 1, 2, 3, 4, 5, 6],
      trips_per_day: [3, 6],
      first_departure_h: [5.5, 7.5],
      trip_min: [70, 130],
      pause_min: [20, 70],
      urban_kmh: 40,
      highway_kmh: 72,
      climb_kmh: 30,
      climb_grade_pct: [4, 7],
      mix: { urban: 4, highway: 2, grades: 1, idle: 1.5 },
      idle_aux_kw: [55, 75],
      idle_min: [8, 16],
    },
  },
  van: {
    key: 'van',
    type: '3.5 t battery-electric van',
    powertrain: 'bev',
    drivetrain_efficiency: 0.8,
    coolant_heat_fraction: 0.35,
    mass_kg: [2_500, 2_700],
    payload_kg: [100, 900],
    cda_m2: 1.7,
    crr: 0.009,
    rated_kw: 100,
    regen_share: 0.65,
    min_power_kw: -60,
    accel_ms2: 1.3,
    aux_base_kw: 0.6,
    aux_ac_kw_per_k: 0.18,
    radiator_area_m2: [0.34, 0.4],
    coolant_limit_c: [62, 68],
    thermostat_open_c: 38,
    thermostat_full_open_c: 44,
    thermal_mass_kj_per_k: [45, 55],
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: [22, 28], speed_kmh: 30, fan_pct: 100 },
    margin: [0.2, 0.35],
    airside: { ram_face_ratio: 0.18, fan_face_velocity_ms: 3.5, velocity_exponent: 0.55 },
    pump_lpm: [45, 55],
    fan_start_c: 46,
    fan_full_c: 58,
    fan_ac_min_pct: 80,
    derate_release_k: 3,
    derate_power_share: 0.5,
    soak_tau_h: 1,
    route_max_ambient_c: 38,
    duty: {
      days_of_week: [1, 2, 3, 4, 5, 6],
      trips_per_day: [2, 5],
      first_departure_h: [6, 8.5],
      trip_min: [50, 110],
      pause_min: [15, 60],
      urban_kmh: 45,
      highway_kmh: 95,
      climb_kmh: 55,
      climb_grade_pct: [5, 8],
      mix: { urban: 2, highway: 3, grades: 1.5, idle: 0.5 },
      idle_aux_kw: [3, 6],
      idle_min: [5, 12],
    },
  },
  truck: {
    key: 'truck',
    type: '40 t diesel tractor-trailer',
    powertrain: 'ice',
    drivetrain_efficiency: 0.4,
    mass_kg: [15_000, 16_000],
    payload_kg: [8_000, 24_000],
    cda_m2: 6.0,
    crr: 0.0065,
    rated_kw: 330,
    regen_share: 0,
    min_power_kw: -25,
    accel_ms2: 0.5,
    aux_base_kw: 4,
    aux_ac_kw_per_k: 0.25,
    radiator_area_m2: [0.95, 1.1],
    coolant_limit_c: 105,
    thermostat_open_c: 78,
    thermostat_full_open_c: 85,
    thermal_mass_kj_per_k: [400, 440],
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: [190, 230], speed_kmh: 30, fan_pct: 100 },
    margin: [0.2, 0.35],
    airside: { ram_face_ratio: 0.25, fan_face_velocity_ms: 5, velocity_exponent: 0.5 },
    pump_lpm: [330, 370],
    fan_start_c: 92,
    fan_full_c: 100,
    fan_ac_min_pct: 0,
    derate_release_k: 3,
    derate_power_share: 0.6,
    soak_tau_h: 2.5,
    route_max_ambient_c: 38,
    duty: {
      days_of_week: [1, 2, 3, 4, 5],
      trips_per_day: [2, 4],
      first_departure_h: [5, 7],
      trip_min: [90, 180],
      pause_min: [30, 90],
      urban_kmh: 40,
      highway_kmh: 80,
      climb_kmh: 60,
      climb_grade_pct: [2.5, 4],
      mix: { urban: 1, highway: 3, grades: 3, idle: 0.5 },
      idle_aux_kw: [15, 25],
      idle_min: [5, 15],
    },
  },
};
