import type { Sample } from '@thermargin/shared';
import type { Climate } from './climate.ts';
import { sensorFaults } from './faults.ts';
import { createRng } from '@thermargin/core/stats/prng';
import { localDay, type TripPlan, tripsOfDay } from './schedule.ts';
import { SensorSuite } from './sensors.ts';
import { endState, type LoopState, runTrip, soak } from './trip-physics.ts';
import type { TripTruth } from './truth.ts';
import type { SimVehicle } from './vehicle.ts';

/** What a vehicle stream is run against. */
export interface StreamContext {
  seed: number;
  climate: Climate;
  utc_offset_h: number;
  /** epoch ms: the simulation starts here, the loop soaked to ambient; trips starting earlier do not exist. */
  origin_ms: number;
}

export interface SimTrip {
  plan: TripPlan;
  truth: TripTruth;
}

/**
 * A vehicle's trips in time order from the origin, each run on the loop state the previous one left
 * (after the soak between them), until the first trip starting at or after `until_ms`.
 * The physics always runs from the origin, so any window of the stream is the same whatever is asked.
 */
export function* vehicleTrips(
  v: SimVehicle,
  ctx: StreamContext,
  until_ms = Number.POSITIVE_INFINITY,
): Generator<SimTrip> {
  let state: LoopState | null = null;
  const lastDay = localDay(Math.min(until_ms, 8.64e15), ctx.utc_offset_h);
  for (let day = localDay(ctx.origin_ms, ctx.utc_offset_h); day <= lastDay; day++) {
    for (const plan of tripsOfDay(v, ctx.seed, day, ctx.utc_offset_h)) {
      if (plan.start_ms < ctx.origin_ms) continue;
      if (plan.start_ms >= until_ms) return;
      const amb = ctx.climate(plan.start_ms);
      const start: LoopState = state
        ? soak(state, plan.start_ms, amb, v.archetype.soak_tau_h)
        : { coolant_c: amb, out_c: amb, at_ms: plan.start_ms };
      const truth = runTrip(v, plan.drive, plan.payload_kg, start, ctx.climate);
      state = endState(truth, v.config.thermal_mass_kj_per_k);
      yield { plan, truth };
    }
  }
}

/** The vehicle's telemetry in [from_ms, to_ms), 1 Hz while a trip runs. */
export function* vehicleSampleStream(
  v: SimVehicle,
  ctx: StreamContext,
  from_ms: number,
  to_ms: number,
): Generator<Sample> {
  const sensors = new SensorSuite(v.id, v.sensors, sensorFaults(v.faults, v.maintenance));
  for (const { plan, truth } of vehicleTrips(v, ctx, to_ms)) {
    const rng = createRng(plan.noise_seed);
    const skip = plan.start_ms + truth.n * 1000 <= from_ms;
    for (let i = 0; i < truth.n; i++) {
      // sensors run on skipped trips too: a stuck sensor holds a value from before the window
      const s = sensors.sample(truth, i, plan.id, rng);
      if (skip || s.time_ms < from_ms) continue;
      if (s.time_ms >= to_ms) return;
      yield s;
    }
  }
}
