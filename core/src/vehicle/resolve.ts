import type {
  FleetInput,
  MaintenanceEntry,
  Policy,
  PolicyInput,
  Powertrain,
  VehicleConfigInput,
} from '@thermargin/shared';
import { resolvePolicy } from '@thermargin/shared';
import { AIRSIDE_DEFAULTS, type Airside } from '../radiator/airside.ts';

/** A vehicle from the fleet file with every default filled in: what the core computes with. */
export interface VehicleModel {
  id: string;
  type: string;
  powertrain: Powertrain;
  drivetrain_efficiency: number;
  coolant_heat_fraction: number;
  radiator_area_m2: number;
  coolant_limit_c: number;
  thermostat_open_c: number;
  thermostat_full_open_c: number;
  thermal_mass_kj_per_k: number;
  /** s: first-order time constant of the coolant temperature sensors; 0 when unknown (default). */
  coolant_sensor_lag_s: number;
  coolant_glycol_pct: number;
  design: VehicleConfigInput['design'];
  bench_k_w_m2k: { ram: number; fan: number } | null;
  airside: Airside;
  /** Where each air-side figure came from before the vehicle stage learns them. */
  airside_basis: Record<
    'ram_face_ratio' | 'fan_face_velocity_ms' | 'velocity_exponent',
    'fleet_file' | 'default'
  >;
  /** kW: unmeasured steady heat into the loop; the fleet file's aux_heat_kw, else 0. */
  aux_heat_kw: number;
  /** Whether aux_heat_kw came from the fleet file (then it is known, not estimated). */
  aux_heat_known: boolean;
  route_max_ambient_c: number | null;
  /** The fleet file's model a vehicle-stage model was learned from (core/vehicle/learn.ts); absent otherwise. */
  learned_from?: VehicleModel;
  maintenance: MaintenanceEntry[];
  policy: Policy;
}

/**
 * Share of the energy input that lands in the coolant loop when the fleet file does not say:
 * electric drivetrains lose (1 − η) and nearly all of it to the coolant; combustion engines follow the
 * one-third rule (common practice: a third each to shaft, coolant and exhaust).
 */
export function defaultCoolantHeatFraction(powertrain: Powertrain, drivetrain_efficiency: number): number {
  return powertrain === 'ice' ? 1 / 3 : 1 - drivetrain_efficiency;
}

/**
 * °C at which the thermostat is taken as fully open when the fleet file does not say: 10 K above
 * start-to-open (wax elements travel over about 10–15 K, from memory), but never more than 60 % of the
 * way to the coolant limit, so a tight loop keeps some valid range.
 */
export function defaultThermostatFullOpen_c(open_c: number, limit_c: number): number {
  return open_c + Math.min(10, 0.6 * (limit_c - open_c));
}

function airsideBasis(given: Partial<Airside> | undefined): VehicleModel['airside_basis'] {
  const of = (k: keyof VehicleModel['airside_basis']) =>
    given?.[k] === undefined ? 'default' : 'fleet_file';
  return {
    ram_face_ratio: of('ram_face_ratio'),
    fan_face_velocity_ms: of('fan_face_velocity_ms'),
    velocity_exponent: of('velocity_exponent'),
  };
}

export function resolveVehicle(v: VehicleConfigInput, fleetPolicy?: PolicyInput): VehicleModel {
  const maintenance = [...(v.maintenance ?? [])].sort((a, b) => a.date.localeCompare(b.date));
  const route =
    v.route_max_ambient_c ?? v.policy?.route_max_ambient_c ?? fleetPolicy?.route_max_ambient_c ?? null;
  return {
    id: v.id,
    type: v.type ?? v.powertrain,
    powertrain: v.powertrain,
    drivetrain_efficiency: v.drivetrain_efficiency,
    coolant_heat_fraction:
      v.coolant_heat_fraction ?? defaultCoolantHeatFraction(v.powertrain, v.drivetrain_efficiency),
    radiator_area_m2: v.radiator_area_m2,
    coolant_limit_c: v.coolant_limit_c,
    thermostat_open_c: v.thermostat_open_c,
    thermostat_full_open_c:
      v.thermostat_full_open_c ?? defaultThermostatFullOpen_c(v.thermostat_open_c, v.coolant_limit_c),
    thermal_mass_kj_per_k: v.thermal_mass_kj_per_k,
    coolant_sensor_lag_s: v.coolant_sensor_lag_s ?? 0,
    coolant_glycol_pct: v.coolant_glycol_pct,
    design: v.design,
    bench_k_w_m2k: v.bench_k_w_m2k ?? null,
    airside: { ...AIRSIDE_DEFAULTS, ...v.airside },
    airside_basis: airsideBasis(v.airside),
    aux_heat_kw: v.aux_heat_kw ?? 0,
    aux_heat_known: v.aux_heat_kw !== undefined,
    route_max_ambient_c: route,
    maintenance,
    policy: resolvePolicy(fleetPolicy, v.policy, { route_max_ambient_c: route }),
  };
}

export function resolveFleet(f: FleetInput): VehicleModel[] {
  return f.vehicles.map((v) => resolveVehicle(v, f.policy));
}
