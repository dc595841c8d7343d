import type { Sample, VehicleConfigInput } from '@thermargin/shared';

/** A plain fuel-cell bus config for unit tests (invented figures). */
export const BUS_CONFIG: VehicleConfigInput = {
  id: 'bus-01',
  powertrain: 'fcev',
  drivetrain_efficiency: 0.45,
  radiator_area_m2: 2,
  coolant_limit_c: 85,
  thermostat_open_c: 65,
  thermal_mass_kj_per_k: 150,
  coolant_glycol_pct: 50,
  design: { ambient_c: 40, heat_kw: 120, speed_kmh: 15, fan_pct: 100 },
};

/** A steady highway sample at `i` seconds from 2026-07-01T08:00Z. */
export function highwaySample(i: number, over: Partial<Sample> = {}): Sample {
  return {
    time_ms: Date.UTC(2026, 6, 1, 8) + i * 1000,
    vehicle: 'bus-01',
    speed_kmh: 85,
    power_kw: 60,
    coolant_in_c: 80,
    ambient_c: 35,
    fan_pct: 0,
    ...over,
  };
}
