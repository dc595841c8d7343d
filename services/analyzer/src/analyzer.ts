import type { MaintenanceEntry, Status, TripResult } from '@thermargin/shared';
import type { Logger } from '@thermargin/shared/log';
import {
  isStorageError,
  type LateMark,
  type SampleStore,
  storeEngine,
  storeFault,
  type VehicleSpan,
} from '@thermargin/store';
import type { AnalysisCommit, AnalysisStore, StoredAnalysis } from '@thermargin/store/analysis';
import { LeaseLostError, type VehicleLeases, WatermarkMovedError } from '@thermargin/store/leases';
import { tripGoingOn } from '@thermargin/core/trip/split';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import { type AnalysisProgress, assessAndCommit, noProgress } from '@thermargin/usecases/commit';
import { catchUpVehicle } from './catch-up.ts';
import { ANALYZER_DEFAULTS, type AnalyzerOptions } from './options.ts';

export interface AnalyzerDeps {
  samples: SampleStore;
  results: AnalysisStore;
  /** The fleet file's vehicles by id; called on every run, so a reload takes effect at the next one. */
  fleet: () => ReadonlyMap<string, VehicleModel>;
  /** Maintenance entries recorded beside the fleet file (the API's), per vehicle. */
  extraMaintenance?: (vehicle: string) => Promise<MaintenanceEntry[]>;
  /** ms since epoch; injected so tests control "no samples for 5 minutes". */
  clock?: () => number;
  log?: Logger;
  /** Told of each trip analysed and each status change (the API's live events). */
  onTrips?: (vehicle: string, trips: readonly TripResult[]) => void;
  onStatus?: (vehicle: string, from: Status | null, to: Status) => void;
  /** Leases shared with other analyzer replicas (PostgreSQL results); absent: this is the only one. */
  leases?: VehicleLeases;
}

/** A vehicle this analyzer may work on now. */
interface HeldVehicle {
  /** What its commit carries (undefined without leases), given the watermark the work began from. */
  fence(from_ms: number | null): AnalysisCommit['fence'];
  release(): Promise<void>;
}

export interface AnalyzerStats {
  /** A pass is going on. */
  running: boolean;
  /** Polling for new samples (started and not stopped): idle between passes. */
  polling: boolean;
  /** ms: since when the counts below count (this process's analyzer was made). */
  counting_since_ms: number;
  runs: number;
  last_run_ms: number | null;
  last_error: string | null;
  trips_analysed: number;
  samples_analysed: number;
  /** Vehicles left with samples past their watermark after the last pass, not counting a trip going on. */
  backlog_vehicles: number;
  /** Samples that arrived after their time had been analysed; the trips they touch were analysed again. */
  late_samples: number;
  /** Vehicles passed over because another replica held their lease (cumulative). */
  vehicles_held_elsewhere: number;
}

export interface RunScope {
  vehicle?: string;
  /** Recompute from this time on (re-analysis); absent: continue from each watermark. */
  since_ms?: number;
}

export interface Analyzer {
  readonly stats: AnalyzerStats;
  /** Polls every `poll_ms` until stopped. */
  start(): void;
  /** Runs soon (e.g. after an ingest), without waiting for the poll interval. */
  poke(): void;
  /** One pass over every vehicle with new samples; resolves when done (queued behind a running pass). */
  runOnce(scope?: RunScope): Promise<void>;
  /** Recomputes after a fleet-file or policy change; every vehicle unless one is given. */
  reanalyze(scope?: RunScope): Promise<void>;
  /** Re-assesses one vehicle from its stored trips (after a maintenance entry); no samples are read. */
  reassess(vehicle: string): Promise<void>;
  stop(): Promise<void>;
}

/** Per vehicle, the earliest late time and how many late samples its marks hold. */
function earliestLate(marks: readonly LateMark[]): Map<string, { from_ms: number; count: number }> {
  const out = new Map<string, { from_ms: number; count: number }>();
  for (const m of marks) {
    const v = out.get(m.vehicle);
    if (v) {
      v.from_ms = Math.min(v.from_ms, m.from_ms);
      v.count += m.count;
    } else out.set(m.vehicle, { from_ms: m.from_ms, count: m.count });
  }
  return out;
}

export function createAnalyzer(deps: AnalyzerDeps, options: Partial<AnalyzerOptions> = {}): Analyzer {
  const o = { ...ANALYZER_DEFAULTS, ...options };
  const clock = deps.clock ?? Date.now;
  const log = deps.log ?? (() => {});
  const extra = deps.extraMaintenance ?? (async () => []);
  const stats: AnalyzerStats = {
    running: false,
    polling: false,
    counting_since_ms: clock(),
    runs: 0,
    last_run_ms: null,
    last_error: null,
    trips_analysed: 0,
    samples_analysed: 0,
    backlog_vehicles: 0,
    late_samples: 0,
    vehicles_held_elsewhere: 0,
  };
  let chain: Promise<void> = Promise.resolve();
  let timer: NodeJS.Timeout | undefined;
  let stopped = false;

  async function commit(model: VehicleModel, input: Parameters<typeof assessAndCommit>[3]) {
    const out = await assessAndCommit(deps.results, model, await extra(model.id), input, clock());
    if (input.trips.length) deps.onTrips?.(model.id, input.trips);
    if (out.status !== out.status_before) deps.onStatus?.(model.id, out.status_before, out.status);
  }

  /** Where this replica starts its pass over the vehicles: replicas starting apart take different
   *  vehicles first instead of queueing for the same lease. */
  const offset = deps.leases ? hashOf(deps.leases.holder) : 0;

  async function pass(scope: RunScope): Promise<void> {
    const fleet = deps.fleet();
    // Read before the samples: a late write after this leaves a mark for the next pass.
    const marks = (await deps.samples.lateMarks()).filter(
      (m) => scope.vehicle === undefined || m.vehicle === scope.vehicle,
    );
    const late = earliestLate(marks);
    /** The earliest late time behind the watermark: the span reopens from the trip it touches. */
    const reopens = (prev: StoredAnalysis | undefined, vehicle: string) => {
      const mark = late.get(vehicle);
      return mark && prev && mark.from_ms < prev.analysed_to_ms ? mark.from_ms : undefined;
    };
    const spans = rotate(await deps.samples.listVehicles(), offset);
    // Vehicles whose marks this pass dealt with: analysed under this replica's lease, found done, or
    // not in the fleet. Another replica's vehicles keep their marks for it.
    const dealt = new Set(marks.filter((m) => !fleet.has(m.vehicle)).map((m) => m.vehicle));
    let backlog = 0;
    for (const span of spans) {
      const model = fleet.get(span.vehicle);
      if (!model || (scope.vehicle !== undefined && span.vehicle !== scope.vehicle)) continue;
      const seen = await deps.results.readAnalysis(span.vehicle);
      if (scope.since_ms === undefined && reopens(seen, span.vehicle) === undefined && done(seen, span)) {
        dealt.add(span.vehicle);
        continue;
      }
      const held = await holdVehicle(span.vehicle);
      if (!held) {
        stats.vehicles_held_elsewhere++;
        continue; // another replica is on it
      }
      try {
        // Read again under the lease: another replica may have committed since.
        const prev = deps.leases ? await deps.results.readAnalysis(span.vehicle) : seen;
        const reopen = reopens(prev, span.vehicle);
        if (reopen !== undefined) stats.late_samples += late.get(span.vehicle)!.count;
        const since_ms = scope.since_ms ?? reopen;
        if (since_ms !== undefined || !done(prev, span))
          if (await analyseVehicle(model, span, prev, since_ms, held)) backlog++;
        dealt.add(span.vehicle);
      } catch (e) {
        if (!(e instanceof LeaseLostError || e instanceof WatermarkMovedError)) throw e;
        log('analyzer_lease_lost', { vehicle: span.vehicle, error: e.message });
      } finally {
        await held.release();
      }
    }
    stats.backlog_vehicles = backlog;
    await deps.samples.clearLateMarks(marks.filter((m) => dealt.has(m.vehicle)));
  }

  /** Analysed past the span's last sample. */
  const done = (prev: StoredAnalysis | undefined, span: VehicleSpan) =>
    prev !== undefined && prev.analysed_to_ms > span.last_ms;

  /** The vehicle's lease kept renewed until released; null when another replica holds it. */
  async function holdVehicle(vehicle: string): Promise<HeldVehicle | null> {
    const leases = deps.leases;
    if (!leases) return { fence: () => undefined, release: async () => {} };
    const lease = await leases.acquire(vehicle);
    if (!lease) return null;
    const timer = setInterval(() => {
      leases.renew(lease).catch(() => {}); // a failed renewal shows as a refused commit
    }, leases.ttl_ms / 3);
    return {
      fence: (from_ms) => ({ lease, from_ms }),
      release: async () => {
        clearInterval(timer);
        await leases.release(lease).catch(() => {}); // expires by itself
      },
    };
  }

  /** Catches one vehicle up (or redoes it from `since_ms`) and commits; true when it is left behind. */
  async function analyseVehicle(
    model: VehicleModel,
    span: VehicleSpan,
    prev: StoredAnalysis | undefined,
    since_ms: number | undefined,
    held: HeldVehicle,
  ): Promise<boolean> {
    const redo = since_ms !== undefined;
    let start: AnalysisProgress = prev ?? { ...noProgress(), analysed_to_ms: span.first_ms };
    let delete_from_ms: number | undefined;
    if (redo) {
      const since = Math.max(since_ms, span.first_ms);
      const stored = (await deps.results.readTripResults(span.vehicle)).filter(
        (t) => Date.parse(t.start) < since,
      );
      // A trip ending within the trip gap before `since` may take the new samples in: redone too.
      const touched = stored.find((t) => Date.parse(t.end) >= since - o.trip_gap_s * 1000);
      delete_from_ms = touched ? Date.parse(touched.start) : since;
      const before = stored.filter((t) => Date.parse(t.start) < delete_from_ms!).at(-1);
      start = {
        analysed_to_ms: delete_from_ms,
        previous_end_ms: before ? Date.parse(before.end) : null,
        last_trip: null,
        rejected: since <= span.first_ms ? {} : { ...(prev?.rejected ?? {}) },
      };
    }
    const got = await catchUpVehicle(deps.samples, model, span, start, clock(), o);
    stats.samples_analysed += got.samples;
    stats.trips_analysed += got.trips.length;
    if (got.trips.length || redo) {
      const fence = held.fence(prev?.analysed_to_ms ?? null);
      await commit(model, {
        trips: got.trips,
        state: got.state,
        ...(delete_from_ms === undefined ? {} : { delete_from_ms }),
        ...(fence ? { fence } : {}),
      });
    }
    return got.state.analysed_to_ms <= span.last_ms && !tripGoingOn(span.last_ms, clock(), o.trip_gap_s);
  }

  function enqueue(work: () => Promise<void>): Promise<void> {
    const run = chain.then(async () => {
      stats.running = true;
      try {
        await work();
        stats.last_error = null;
      } catch (e) {
        // A store that refuses (disk full, read-only, locked) is said so, as every part says it.
        stats.last_error = isStorageError(e)
          ? `${storeNamed(e)}: ${storeFault(e).reason}`
          : (e as Error).message;
        log('analyzer_error', { error: stats.last_error });
        throw e;
      } finally {
        stats.running = false;
        stats.runs++;
        stats.last_run_ms = clock();
      }
    });
    chain = run.catch(() => {});
    return run;
  }

  const schedule = (ms: number) => {
    if (stopped) return;
    clearTimeout(timer);
    timer = setTimeout(() => {
      enqueue(() => pass({}))
        .catch(() => {})
        .finally(() => schedule(o.poll_ms));
    }, ms);
  };

  return {
    stats,
    start: () => {
      stopped = false;
      stats.polling = true;
      schedule(0);
    },
    poke: () => schedule(0),
    runOnce: (scope = {}) => enqueue(() => pass({ ...scope, since_ms: undefined })),
    reanalyze: (scope = {}) =>
      enqueue(() => pass({ ...scope, since_ms: scope.since_ms ?? Number.NEGATIVE_INFINITY })),
    reassess: (vehicle) =>
      enqueue(async () => {
        const model = deps.fleet().get(vehicle);
        if (model) await commit(model, { trips: [] });
      }),
    stop: async () => {
      stopped = true;
      stats.polling = false;
      clearTimeout(timer);
      await chain;
    },
  };
}

/** `list` started at `offset` (mod its length) and wrapped around. */
function rotate<T>(list: readonly T[], offset: number): T[] {
  const k = list.length ? offset % list.length : 0;
  return [...list.slice(k), ...list.slice(0, k)];
}

/** The store an error came from, as far as its code tells: its database, else just "store". */
function storeNamed(e: unknown): string {
  const engine = storeEngine(e);
  return engine ? `store (${engine})` : 'store';
}

/** A small non-negative hash of a name (FNV-1a). */
function hashOf(name: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < name.length; i++) h = Math.imul(h ^ name.charCodeAt(i), 0x01000193);
  return h >>> 0;
}
