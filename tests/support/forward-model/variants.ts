import { type Rng, substream, uniform } from './prng.ts';
import type { Fouling } from './radiator.ts';
import type { Scenario } from './scenario.ts';
import type { SensorSpec } from './sensors.ts';
import { HOT_TRIPS, hotMixedTrip } from './trips.ts';
import type { VehicleSpec } from './vehicle-spec.ts';
import { VEHICLES } from './vehicles.ts';

/**
 * Randomly perturbed vehicles, loops, sensors and days, drawn from a seed: a scenario set nobody tuned
 * the estimator on. Ranges: thermal mass ×0.5–2, air-side h exponent 0.50–0.65, fin parameter
 * 0.6–1.1, fan-curve slope ×0.5–1.5, sensor lag 1–5 s, coolant noise 0.1–0.3 K, power noise 0.5–2 %,
 * sampling 0.5/1/2 s, ambient −2…+4 K, flow meter on or off, and every third one fouled.
 * The fleet file's exponent is refitted to the perturbed clean core (the bench test of that core);
 * fouling is not in the fleet file, as in service.
 */
export interface Variant {
  label: string;
  scenario: Scenario;
}

const INTERVALS_S = [0.5, 1, 2];

function perturbedVehicle(base: VehicleSpec, rng: Rng): VehicleSpec {
  return {
    ...base,
    thermal_mass_kj_per_k: base.thermal_mass_kj_per_k * 2 ** uniform(rng, -1, 1),
    core: { ...base.core, air_h_exponent: uniform(rng, 0.5, 0.65), fin_ml_ref: uniform(rng, 0.6, 1.1) },
    airflow: {
      ...base.airflow,
      fan_curve_slope_ms: base.airflow.fan_curve_slope_ms * uniform(rng, 0.5, 1.5),
    },
    sensor_lag_s: uniform(rng, 1, 5),
  };
}

export function drawVariant(seed: number, index: number): Variant {
  const rng = substream(seed, 100 + index);
  const base = VEHICLES[index % VEHICLES.length]!;
  const vehicle = perturbedVehicle(base, rng);
  const sensors: Partial<SensorSpec> = {
    coolant_noise_k: uniform(rng, 0.1, 0.3),
    power_noise_share: uniform(rng, 0.005, 0.02),
    interval_s: INTERVALS_S[Math.floor(rng() * INTERVALS_S.length)]!,
    flow_meter: rng() < 0.5,
  };
  const shift_k = uniform(rng, -2, 4);
  const trip = HOT_TRIPS[base.id]!;
  const fouling: Fouling | undefined =
    index % 3 === 2
      ? { air_resistance_m2k_w: uniform(rng, 2e-5, 6e-5), air_blockage: uniform(rng, 0.03, 0.1) }
      : undefined;
  const profile = hotMixedTrip({
    ...trip,
    ambient_start_c: trip.ambient_start_c + shift_k,
    ambient_end_c: trip.ambient_end_c + shift_k,
  });
  const label =
    `variant ${index} (${base.id}, C ${vehicle.thermal_mass_kj_per_k.toFixed(0)} kJ/K, m ${vehicle.core.air_h_exponent.toFixed(2)}, ` +
    `σ ${sensors.coolant_noise_k!.toFixed(2)} K, ${sensors.interval_s} s, ambient ${shift_k >= 0 ? '+' : ''}${shift_k.toFixed(1)} K, ` +
    `flow meter ${sensors.flow_meter ? 'on' : 'off'}${fouling ? ', fouled' : ''})`;
  return {
    label,
    scenario: { vehicle, profile, sensors, seed: seed * 1000 + index, ...(fouling ? { fouling } : {}) },
  };
}
