import type { Sample, VehicleConfigInput } from '@thermargin/shared';
import { driveTrace, type TripProfile } from './drive-profile.ts';
import { fleetConfig } from './fleet-config.ts';
import { type LoopTrace, simulateLoop } from './loop.ts';
import { substream } from './prng.ts';
import { CLEAN, type Fouling } from './radiator.ts';
import { readSensors, SENSOR_DEFAULTS, type SensorSpec } from './sensors.ts';
import { type BandTruth, bandTruth } from './truth.ts';
import type { VehicleSpec } from './vehicle-spec.ts';

/** s: integration step of the loop model; every sampling interval must be a multiple of it. */
export const MODEL_STEP_S = 0.25;
/** Epoch ms the trips start at (a summer morning); fixed so runs are reproducible. */
export const TRIP_START_MS = Date.UTC(2025, 6, 15, 7, 0, 0);

export interface Scenario {
  vehicle: VehicleSpec;
  profile: TripProfile;
  sensors?: Partial<SensorSpec>;
  fouling?: Fouling;
  seed: number;
  /** °C at key-on; default ambient (a cold soak). */
  start_c?: number;
  trip?: string;
  /** Epoch ms of the first sample; default TRIP_START_MS. */
  start_ms?: number;
}

export interface ScenarioRun {
  samples: Sample[];
  trace: LoopTrace;
  config: VehicleConfigInput;
  truth: { ram: BandTruth; fan: BandTruth };
}

/** Runs one trip: drive profile (seeded), loop model, sensors (seeded separately), truth per band. */
export function runScenario(s: Scenario): ScenarioRun {
  const fouling = s.fouling ?? CLEAN;
  const drive = driveTrace(s.profile, MODEL_STEP_S, substream(s.seed, 0));
  const trace = simulateLoop(s.vehicle, drive, fouling, s.start_c);
  const sensors = { ...SENSOR_DEFAULTS, ...s.sensors };
  const ids = {
    vehicle: s.vehicle.id,
    trip: s.trip ?? `trip-${s.seed}`,
    start_ms: s.start_ms ?? TRIP_START_MS,
  };
  return {
    samples: readSensors(trace, sensors, ids, substream(s.seed, 1)),
    trace,
    config: fleetConfig(s.vehicle),
    truth: {
      ram: bandTruth(s.vehicle, trace, 'ram', fouling),
      fan: bandTruth(s.vehicle, trace, 'fan', fouling),
    },
  };
}
