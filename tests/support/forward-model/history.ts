import type { VehicleConfigInput } from '@thermargin/shared';
import { AIRSIDE_DEFAULTS } from '@thermargin/core/radiator/airside';
import type { TripProfile } from './drive-profile.ts';
import { fleetConfig } from './fleet-config.ts';
import { type Rng, substream, uniform } from './prng.ts';
import type { Fouling } from './radiator.ts';
import type { Scenario } from './scenario.ts';
import type { SensorSpec } from './sensors.ts';
import { HOT_TRIPS, type HotTripOptions, hotMixedTrip, stopAndGoTrip } from './trips.ts';
import type { VehicleSpec } from './vehicle-spec.ts';
import { VEHICLES } from './vehicles.ts';

/**
 * A vehicle's history of trips drawn from a seed: the recovery suite of the per-vehicle air-side fit.
 * The vehicle differs from the core's air-side defaults as real ones do (air-side h exponent
 * 0.45–0.65, ram face-velocity ratio and fan face velocity ±40 % from the defaults, fin parameter,
 * fan-curve slope, thermal mass, sensor lag), carries unmeasured steady heat of 0–5 % of its load,
 * and in a third of the draws an ambient sensor offset of up to ±1.5 K. The fleet file gives the
 * loop's figures but, in three draws of four, no `airside` (so the core starts from its defaults);
 * in the fourth, the bench figures of the clean core. Trips: a morning and an afternoon one a day,
 * each after a soak of ≥ 6 h, of four kinds (mixed, highway, stop-and-go, short) on days from
 * 10 K cooler to 5 K hotter than the vehicle's hot day; in every third draw the radiator fouls
 * steadily over the history.
 */
export interface History {
  label: string;
  vehicle: VehicleSpec;
  fleet: VehicleConfigInput;
  /** Each trip with its own seed, start time and fouling. */
  trips: Scenario[];
  unmeasured_heat_kw: number;
  ambient_offset_k: number;
}

export const HISTORY_DEFAULTS = { trips: 30 } as const;

const DAY_MS = 86_400_000;
/** Epoch ms of the first day's midnight. */
const FIRST_DAY_MS = Date.UTC(2025, 5, 2);
const SLOT_H = [6, 15] as const;
const INTERVALS_S = [0.5, 1, 2];

/** Highway speed span of each base vehicle (km/h): its usual road speeds. */
const SPEEDS: Record<string, [number, number]> = {
  'fc-bus-01': [60, 90],
  'ev-van-01': [65, 115],
  'dx-truck-01': [65, 90],
};

function perturbed(base: VehicleSpec, rng: Rng): VehicleSpec {
  return {
    ...base,
    thermal_mass_kj_per_k: base.thermal_mass_kj_per_k * 2 ** uniform(rng, -1, 1),
    core: { ...base.core, air_h_exponent: uniform(rng, 0.45, 0.65), fin_ml_ref: uniform(rng, 0.6, 1.1) },
    airflow: {
      ram_face_ratio: AIRSIDE_DEFAULTS.ram_face_ratio * uniform(rng, 0.6, 1.4),
      fan_face_velocity_ms: AIRSIDE_DEFAULTS.fan_face_velocity_ms * uniform(rng, 0.6, 1.4),
      fan_curve_slope_ms: base.airflow.fan_curve_slope_ms * uniform(rng, 0.5, 1.5),
    },
    sensor_lag_s: uniform(rng, 1, 5),
  };
}

function tripProfile(base: HotTripOptions, speeds: [number, number], rng: Rng): TripProfile {
  const shift_k = uniform(rng, -10, 5);
  const lo = uniform(rng, speeds[0], speeds[0] + 0.4 * (speeds[1] - speeds[0]));
  const hi = uniform(rng, lo + 10, speeds[1]);
  const day = {
    ...base,
    highway_kmh: [lo, hi] as [number, number],
    ambient_start_c: base.ambient_start_c + shift_k,
    ambient_end_c: base.ambient_end_c + shift_k,
  };
  const kind = rng();
  if (kind < 0.4)
    return hotMixedTrip({
      ...day,
      highway_s: uniform(rng, 600, 2700),
      crawl_s: uniform(rng, 300, 1800),
      standing_s: uniform(rng, 0, 1200),
    });
  if (kind < 0.6)
    return hotMixedTrip({ ...day, highway_s: uniform(rng, 1200, 3600), crawl_s: 0, standing_s: 0 });
  if (kind < 0.8) {
    const p = stopAndGoTrip({
      grade: base.crawl_grade,
      aux_kw: base.aux_kw,
      go_s: [20, 120],
      stop_s: [5, 40],
      duration_s: uniform(rng, 1200, 3600),
    });
    return { ...p, ambient_start_c: day.ambient_start_c, ambient_end_c: day.ambient_end_c };
  }
  return hotMixedTrip({
    ...day,
    highway_s: uniform(rng, 200, 600),
    crawl_s: uniform(rng, 150, 500),
    standing_s: uniform(rng, 0, 300),
  });
}

/** kW: the vehicle's mean traction heat into the coolant on its hot mixed trip (the forward model's own figure). */
export type MeanLoad = (v: VehicleSpec, profile: TripProfile) => number;

/**
 * History `index` of `seed`. `meanLoad` gives the load the unmeasured heat is a share of (passed in so
 * this module stays a pure description of the draw).
 */
export function drawHistory(
  seed: number,
  index: number,
  meanLoad: MeanLoad,
  o: { trips: number } = HISTORY_DEFAULTS,
): History {
  const rng = substream(seed, 500 + index);
  const base = VEHICLES[index % VEHICLES.length]!;
  const shape = perturbed(base, rng);
  const hot = HOT_TRIPS[base.id]!;
  const share = uniform(rng, 0, 0.05);
  const unmeasured_heat_kw = share * meanLoad(shape, hotMixedTrip(hot));
  const vehicle: VehicleSpec = { ...shape, unmeasured_heat_kw };
  const ambient_offset_k = rng() < 1 / 3 ? uniform(rng, -1.5, 1.5) : 0;
  const withAirside = rng() < 0.25;
  const fouls = index % 3 === 2;
  const finalFouling: Fouling = {
    air_resistance_m2k_w: uniform(rng, 2e-5, 6e-5),
    air_blockage: uniform(rng, 0.03, 0.1),
  };
  const sensors: Partial<SensorSpec> = {
    coolant_noise_k: uniform(rng, 0.1, 0.3),
    power_noise_share: uniform(rng, 0.005, 0.02),
    interval_s: INTERVALS_S[Math.floor(rng() * INTERVALS_S.length)]!,
    flow_meter: rng() < 0.5,
    ambient_offset_k,
  };
  const full = fleetConfig(vehicle);
  const { airside, ...withoutAirside } = full;
  const fleet = withAirside ? full : withoutAirside;
  const trips: Scenario[] = Array.from({ length: o.trips }, (_, j) => {
    const f = fouls ? j / Math.max(1, o.trips - 1) : 0;
    return {
      vehicle,
      profile: tripProfile(hot, SPEEDS[base.id]!, rng),
      sensors,
      seed: seed * 100_000 + index * 1000 + j,
      trip: `${base.id}-h${index}-t${String(j).padStart(3, '0')}`,
      start_ms: FIRST_DAY_MS + Math.floor(j / 2) * DAY_MS + SLOT_H[j % 2]! * 3_600_000,
      ...(f > 0
        ? {
            fouling: {
              air_resistance_m2k_w: f * finalFouling.air_resistance_m2k_w,
              air_blockage: f * finalFouling.air_blockage,
            },
          }
        : {}),
    };
  });
  const label =
    `history ${seed}/${index} (${base.id}, m ${shape.core.air_h_exponent.toFixed(2)}, ` +
    `r ${shape.airflow.ram_face_ratio.toFixed(3)}, fan ${shape.airflow.fan_face_velocity_ms.toFixed(2)} m/s, ` +
    `unmeasured ${(share * 100).toFixed(1)} %, ambient ${ambient_offset_k >= 0 ? '+' : ''}${ambient_offset_k.toFixed(2)} K, ` +
    `${sensors.interval_s} s, flow meter ${sensors.flow_meter ? 'on' : 'off'}${withAirside ? ', airside in fleet file' : ''}${fouls ? ', fouling' : ''})`;
  return { label, vehicle, fleet, trips, unmeasured_heat_kw, ambient_offset_k };
}
