import type { VehicleConfigInput } from '@thermargin/shared';
import { designBand, designKa_w_k } from '@thermargin/core/trip/design-point';
import { resolveVehicle, type VehicleModel } from '@thermargin/core/vehicle/resolve';
import { FAN_REFERENCE, RAM_REFERENCE, kReferenceFactor } from '@thermargin/core/radiator/airside';

/** Three vehicle types the health tests run on; numbers are round, plausible figures of our own. */
export const VEHICLE_TYPES = {
  /** Fuel-cell city bus: low loop limit, design point crawling uphill on the fan. */
  city_bus: {
    id: 'bus-01',
    powertrain: 'fcev',
    drivetrain_efficiency: 0.5,
    radiator_area_m2: 1.2,
    coolant_limit_c: 80,
    thermostat_open_c: 60,
    thermal_mass_kj_per_k: 200,
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: 90, speed_kmh: 10, fan_pct: 100 },
    route_max_ambient_c: 38,
  },
  /** Diesel long-haul truck: hot loop, design point at highway speed on ram air. */
  highway_truck: {
    id: 'truck-07',
    powertrain: 'ice',
    drivetrain_efficiency: 0.42,
    radiator_area_m2: 0.9,
    coolant_limit_c: 105,
    thermostat_open_c: 85,
    thermal_mass_kj_per_k: 120,
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: 150, speed_kmh: 80, fan_pct: 0 },
    route_max_ambient_c: 42,
  },
  /** Battery-electric delivery van: cool loop for the cells, design point in stop-and-go traffic on the fan. */
  delivery_van: {
    id: 'van-23',
    powertrain: 'bev',
    drivetrain_efficiency: 0.86,
    radiator_area_m2: 0.45,
    coolant_limit_c: 60,
    thermostat_open_c: 35,
    thermal_mass_kj_per_k: 60,
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: 12, speed_kmh: 15, fan_pct: 100 },
    route_max_ambient_c: 36,
  },
} satisfies Record<string, VehicleConfigInput>;

export type VehicleType = keyof typeof VEHICLE_TYPES;

/** Clean-core band reference k (W/m²K) that gives `margin_pct` at the design point, consistent with the air-side model. */
export function cleanK(type: VehicleType, margin_pct: number): { ram: number; fan: number } {
  const v = resolveVehicle(VEHICLE_TYPES[type]);
  const basis = designBand(v);
  const needKa =
    ((1 + margin_pct / 100) * 1000 * v.design.heat_kw) / (v.coolant_limit_c - v.design.ambient_c);
  const kBasis = needKa / designKa_w_k(v, basis, 1);
  const fanOverRam = kReferenceFactor(RAM_REFERENCE, FAN_REFERENCE, v.airside);
  return basis === 'ram'
    ? { ram: kBasis, fan: kBasis * fanOverRam }
    : { ram: kBasis / fanOverRam, fan: kBasis };
}

export function vehicleModel(type: VehicleType, extra: Partial<VehicleConfigInput> = {}): VehicleModel {
  return resolveVehicle({ ...VEHICLE_TYPES[type], ...extra });
}
