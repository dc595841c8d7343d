import type { VehicleConfigInput } from '@thermargin/shared';
import { COOLANT_GLYCOL_VOL_PCT } from './fluids.ts';
import { fitVelocityExponent } from './radiator.ts';
import type { VehicleSpec } from './vehicle-spec.ts';

/** m/s: face-velocity sweep of the virtual bench test the fleet file's exponent is fitted over. */
export const BENCH_SWEEP_MS = { from_ms: 2.5, to_ms: 8 } as const;
const BENCH_AMBIENT_C = 35;

function benchFlow_lpm(v: VehicleSpec): number {
  return v.pump.kind === 'electric' ? v.pump.flow_lpm : v.pump.flow_at_rated_lpm * 0.75;
}

/**
 * –: the fleet file's velocity_exponent: the log-log slope of the model's clean k(v) over a bench
 * sweep of 2.5–8 m/s (spanning both band references) at the pump's usual flow, coolant 10 K above
 * full open: what an engineer fitting bench data would write down.
 */
export function benchVelocityExponent(v: VehicleSpec): number {
  return fitVelocityExponent(v.core, {
    ...BENCH_SWEEP_MS,
    flow_lpm: benchFlow_lpm(v),
    ambient_c: BENCH_AMBIENT_C,
    coolant_in_c: v.thermostat.full_open_c + 10,
  });
}

/** The vehicle's fleet-file entry (shared/src/fleet.ts shape), airside figures consistent with the model. */
export function fleetConfig(v: VehicleSpec): VehicleConfigInput {
  return {
    id: v.id,
    powertrain: v.powertrain,
    drivetrain_efficiency: v.drivetrain_efficiency,
    coolant_heat_fraction: v.coolant_heat_fraction,
    radiator_area_m2: v.core.area_m2,
    coolant_limit_c: v.coolant_limit_c,
    thermostat_open_c: v.thermostat.open_c,
    thermostat_full_open_c: v.thermostat.full_open_c,
    thermal_mass_kj_per_k: v.thermal_mass_kj_per_k,
    // The sensor's time constant is a datasheet figure of the installation, given as an engineer would.
    coolant_sensor_lag_s: v.sensor_lag_s,
    coolant_glycol_pct: COOLANT_GLYCOL_VOL_PCT,
    design: v.design,
    airside: {
      ram_face_ratio: v.airflow.ram_face_ratio,
      fan_face_velocity_ms: v.airflow.fan_face_velocity_ms,
      velocity_exponent: benchVelocityExponent(v),
    },
  };
}
