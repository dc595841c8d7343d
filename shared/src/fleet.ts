import { z } from 'zod';
import { idSchema } from './ids.ts';
import { dataMapSchema } from './mapping.ts';
import { policySchema } from './policy.ts';
import { numberField } from './validation.ts';

export const POWERTRAINS = ['fcev', 'bev', 'ice'] as const;
export type Powertrain = (typeof POWERTRAINS)[number];

export const MAINTENANCE_ACTIONS = [
  'radiator_cleaned',
  'fan_repaired',
  'coolant_serviced',
  'sensor_replaced',
] as const;
export type MaintenanceAction = (typeof MAINTENANCE_ACTIONS)[number];

const positive = (what: string) => numberField(what).positive(`${what} must be > 0`);
const fraction = (what: string) =>
  numberField(what).gt(0, `${what} must be > 0`).max(1, `${what} must be ≤ 1`);
const celsius = z.number().min(-60).max(200);

export const designPointSchema = z.strictObject({
  ambient_c: z.number().min(-60).max(65),
  heat_kw: positive('design.heat_kw'),
  speed_kmh: z.number().min(0).max(250),
  fan_pct: z.number().min(0).max(100),
});

/**
 * How face velocity follows vehicle speed and fan duty (see core/radiator/airside.ts). Defaults are
 * round figures from memory, to be replaced by the package's bench data where known.
 */
export const airsideSchema = z.strictObject({
  ram_face_ratio: fraction('airside.ram_face_ratio').optional(),
  fan_face_velocity_ms: positive('airside.fan_face_velocity_ms').optional(),
  velocity_exponent: z.number().min(0.2).max(1.2).optional(),
});

export const maintenanceEntrySchema = z.strictObject({
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}(T[\d:.]+Z)?$/, 'date must be YYYY-MM-DD or ISO 8601 UTC'),
  action: z.enum(MAINTENANCE_ACTIONS),
  note: z.string().max(2000).optional(),
  by: z.string().max(200).optional(),
});

export const vehicleConfigSchema = z
  .strictObject({
    id: idSchema,
    powertrain: z.enum(POWERTRAINS),
    drivetrain_efficiency: fraction('drivetrain_efficiency'),
    coolant_heat_fraction: fraction('coolant_heat_fraction').optional(),
    radiator_area_m2: positive('radiator_area_m2'),
    coolant_limit_c: celsius,
    thermostat_open_c: celsius,
    thermostat_full_open_c: celsius.optional(),
    thermal_mass_kj_per_k: positive('thermal_mass_kj_per_k'),
    coolant_sensor_lag_s: z.number().min(0).max(120).optional(),
    coolant_glycol_pct: z.number().min(0).max(60),
    design: designPointSchema,
    bench_k_w_m2k: z
      .strictObject({ ram: positive('bench_k_w_m2k.ram'), fan: positive('bench_k_w_m2k.fan') })
      .optional(),
    airside: airsideSchema.optional(),
    /** kW: steady heat into the loop that the traction power does not carry (pumps, power electronics,
     *  a compressor on the same loop), when known; otherwise the vehicle stage estimates it. */
    aux_heat_kw: z.number().min(0, 'aux_heat_kw must be ≥ 0').max(1000).optional(),
    type: z.string().max(100).optional(),
    route_max_ambient_c: z.number().min(-60).max(65).optional(),
    maintenance: z.array(maintenanceEntrySchema).optional(),
    policy: policySchema.optional(),
    /** How this vehicle's logger data reads: a mapping file (path relative to the fleet file) or one inline. */
    data_map: z.union([z.string().min(1), dataMapSchema]).optional(),
    /** N·m: engine reference torque (SAE J1939 SPN 544) when the bus does not send it. */
    engine_reference_torque_nm: positive('engine_reference_torque_nm').optional(),
  })
  .refine((v) => v.thermostat_open_c < v.coolant_limit_c, {
    message: 'thermostat_open_c must be below coolant_limit_c',
    path: ['thermostat_open_c'],
  })
  .refine((v) => v.design.ambient_c < v.coolant_limit_c, {
    message: 'design.ambient_c must be below coolant_limit_c',
    path: ['design', 'ambient_c'],
  });

export const fleetSchema = z
  .strictObject({
    vehicles: z.array(vehicleConfigSchema).min(1, 'vehicles must list at least one vehicle'),
    policy: policySchema.optional(),
  })
  .refine((f) => new Set(f.vehicles.map((v) => v.id)).size === f.vehicles.length, {
    message: 'vehicle ids must be unique',
    path: ['vehicles'],
  });

export type VehicleConfigInput = z.infer<typeof vehicleConfigSchema>;
export type FleetInput = z.infer<typeof fleetSchema>;
export type DesignPoint = z.infer<typeof designPointSchema>;
export type MaintenanceEntry = z.infer<typeof maintenanceEntrySchema>;
