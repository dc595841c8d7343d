import { DAY_MS } from '@thermargin/shared/time';
import {
  type FleetInput,
  fleetSchema,
  type MaintenanceEntry,
  parseOrThrow,
  type Sample,
} from '@thermargin/shared';
import { CLIMATE_DEFAULTS, type Climate, type ClimateOptions, createClimate } from './climate.ts';
import { demoVehicles, roleEvents } from './default-fleet.ts';
import type { FaultSpec, MaintenanceEvent } from './faults.ts';
import { mergeByTime } from './merge.ts';
import { type SimTrip, type StreamContext, vehicleSampleStream, vehicleTrips } from './vehicle-stream.ts';
import type { SimVehicle } from './vehicle.ts';

/** Faults and workshop visits to inject instead of the demo's own. */
export interface FaultPlan {
  faults: FaultSpec[];
  maintenance: MaintenanceEvent[];
}

export interface ScenarioOptions {
  /** –, 1: everything random follows from it. */
  seed: number;
  /** –, 10: vehicles (the demo roster in priority order, then healthy buses and vans). */
  vehicles: number;
  /** d, 28: days of history before end_ms. */
  days: number;
  /** epoch ms, 2026-08-01T00:00Z: the injected clock; the history ends here. */
  end_ms: number;
  /** 'demo' (default): each roster vehicle's fault case; 'none': all healthy; or a plan of your own. */
  faults: 'demo' | 'none' | FaultPlan;
  /** The town's climate; by default the hottest week lies within the history. */
  climate: Partial<ClimateOptions>;
}

export const SCENARIO_DEFAULTS: Readonly<ScenarioOptions> = Object.freeze({
  seed: 1,
  vehicles: 10,
  days: 28,
  end_ms: Date.UTC(2026, 7, 1),
  faults: 'demo',
  climate: {},
});

export interface TimeRange {
  from_ms?: number;
  to_ms?: number;
}

export interface Scenario {
  options: ScenarioOptions;
  /** The fleet file (valid against fleetSchema), maintenance log included up to end_ms. */
  fleet: FleetInput;
  /** The simulated vehicles: physics, faults and workshop visits. */
  vehicles: SimVehicle[];
  /** epoch ms: [from_ms, to_ms) of the history. */
  history: { from_ms: number; to_ms: number };
  /** True ambient temperature of the town at a time. */
  climate: Climate;
  /** One vehicle's samples in time order (default: the history). */
  vehicleSamples(id: string, range?: TimeRange): Iterable<Sample>;
  /** One vehicle's trips with their true course (for checks of the physics). */
  vehicleTrips(id: string, range?: TimeRange): Iterable<SimTrip>;
  /** The whole fleet's samples merged in time order (default: the history). */
  fleetSamples(range?: TimeRange): Iterable<Sample>;
  /** The same physics going on after the history: the fleet's samples from `from_ms`, without end by default. */
  liveSamples(from_ms: number, to_ms?: number): Iterable<Sample>;
}

const iso = (ms: number) => new Date(ms).toISOString().replace(/\.000Z$/, 'Z');

function checkOptions(o: ScenarioOptions): void {
  const bad = (what: string) => {
    throw new RangeError(`createScenario: ${what}`);
  };
  if (!Number.isInteger(o.seed)) bad(`seed must be an integer, got ${o.seed}`);
  if (!(Number.isInteger(o.vehicles) && o.vehicles >= 1 && o.vehicles <= 500))
    bad(`vehicles must be an integer 1…500, got ${o.vehicles}`);
  if (!(o.days > 0 && o.days <= 3660)) bad(`days must be within (0, 3660], got ${o.days}`);
  if (!Number.isFinite(o.end_ms)) bad(`end_ms must be epoch milliseconds, got ${o.end_ms}`);
}

function maintenanceLog(events: readonly MaintenanceEvent[], end_ms: number): MaintenanceEntry[] {
  return events
    .filter((e) => e.at_ms < end_ms)
    .sort((a, b) => a.at_ms - b.at_ms)
    .map((e) => ({
      date: iso(e.at_ms),
      action: e.action,
      by: 'depot workshop',
      ...(e.note ? { note: e.note } : {}),
    }));
}

/**
 * The demo scenario: fleet, faults and the physics to run them, all from the options (deterministic in
 * the seed). Samples are generated on demand by the iterables; nothing is held in memory but one trip
 * per vehicle.
 */
export function createScenario(options: Partial<ScenarioOptions> = {}): Scenario {
  const o: ScenarioOptions = { ...SCENARIO_DEFAULTS, ...options };
  checkOptions(o);
  const history = { from_ms: o.end_ms - Math.round(o.days * DAY_MS), to_ms: o.end_ms };
  const climateOptions = { ...CLIMATE_DEFAULTS, ...o.climate };
  const climate = createClimate(
    { ...climateOptions, hottest_ms: climateOptions.hottest_ms ?? o.end_ms - 7 * DAY_MS },
    o.seed,
  );
  const timeline = { ...history, utc_offset_h: climateOptions.utc_offset_h };

  const vehicles = demoVehicles(o.vehicles, o.seed).map(({ vehicle, role }) => {
    const plan =
      o.faults === 'none'
        ? { faults: [], maintenance: [] }
        : o.faults === 'demo'
          ? roleEvents(role, vehicle, timeline)
          : {
              faults: o.faults.faults.filter((f) => f.vehicle === vehicle.id),
              maintenance: o.faults.maintenance.filter((m) => m.vehicle === vehicle.id),
            };
    return { ...vehicle, ...plan };
  });
  if (typeof o.faults === 'object') {
    const ids = new Set(vehicles.map((v) => v.id));
    for (const f of [...o.faults.faults, ...o.faults.maintenance])
      if (!ids.has(f.vehicle))
        throw new RangeError(`createScenario: fault plan names unknown vehicle ${JSON.stringify(f.vehicle)}`);
  }

  const fleet = parseOrThrow(
    fleetSchema,
    {
      vehicles: vehicles.map((v) => {
        const log = maintenanceLog(v.maintenance, o.end_ms);
        return log.length ? { ...v.config, maintenance: log } : v.config;
      }),
    },
    'simulated fleet',
  );

  const ctx: StreamContext = {
    seed: o.seed,
    climate,
    utc_offset_h: climateOptions.utc_offset_h,
    origin_ms: history.from_ms,
  };
  const byId = new Map(vehicles.map((v) => [v.id, v]));
  const vehicle = (id: string) => {
    const v = byId.get(id);
    if (!v)
      throw new RangeError(
        `scenario: no vehicle ${JSON.stringify(id)} (have ${[...byId.keys()].join(', ')})`,
      );
    return v;
  };
  const range = (r: TimeRange = {}) => ({ from: r.from_ms ?? history.from_ms, to: r.to_ms ?? history.to_ms });
  const samples = (v: SimVehicle, r?: TimeRange): Iterable<Sample> => {
    const { from, to } = range(r);
    return { [Symbol.iterator]: () => vehicleSampleStream(v, ctx, from, to) };
  };
  const fleetSamples = (r?: TimeRange): Iterable<Sample> => ({
    [Symbol.iterator]: () => mergeByTime(vehicles.map((v) => samples(v, r))),
  });

  return {
    options: o,
    fleet,
    vehicles,
    history,
    climate,
    vehicleSamples: (id, r) => samples(vehicle(id), r),
    vehicleTrips: (id, r) => {
      const v = vehicle(id);
      const { from, to } = range(r);
      return {
        *[Symbol.iterator]() {
          for (const t of vehicleTrips(v, ctx, to)) if (t.plan.start_ms + t.truth.n * 1000 > from) yield t;
        },
      };
    },
    fleetSamples,
    liveSamples: (from_ms, to_ms = Number.POSITIVE_INFINITY) => fleetSamples({ from_ms, to_ms }),
  };
}
