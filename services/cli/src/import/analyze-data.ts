import { availableParallelism } from 'node:os';
import { InputError, type RejectedSummary } from '@thermargin/shared';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import type { FrameCounts } from '@thermargin/logger-data/j1939/decoder';
import { listDataFiles } from '../import/data-files.ts';
import { DataReader, loadContext, type StreamOutcome } from '../import/data-reader.ts';
import { planJobs, type ReadResult, readInParallel } from '../import/parallel-read.ts';
import { progressReporter } from '../import/progress.ts';
import { NoteMerger, vehicleReasons } from '../import/row-audit.ts';
import type { VehicleStream } from '../import/vehicle-stream.ts';

export interface AnalyzedData {
  vehicles: VehicleModel[];
  streams: Map<string, StreamOutcome>;
  rejected: RejectedSummary;
  rows: number;
  /** Per vehicle fed from candump logs: what its frames held. */
  frames: Record<string, FrameCounts>;
  /** Why a vehicle has no trips, in words (its data's refusals, or no data at all). */
  whyNoTrips(vehicle: string): string;
}

export interface DataOptions {
  /** Mapping file (--map) for every file whose vehicle has no mapping of its own in the fleet file. */
  map?: string | undefined;
  /** bytes: the longest line read, tables and candump logs alike (--max-line-bytes; default MAX_LINE_BYTES). */
  max_line_bytes?: number | undefined;
  /** Threads reading and analysing (default: the machine's cores; 1 with an observer). */
  threads?: number | undefined;
}

/** bytes: below this much data one thread is quicker than starting workers (each loads the code, ≈ 0.5 s CPU). */
const PARALLEL_MIN_BYTES = 32 << 20;

/**
 * Reads the fleet file and every data file at `dataPath` — tables in the import format or through a
 * mapping, and candump logs of J1939 frames — analysing trips as they complete. On a folder of several
 * vehicles and enough data, vehicles are spread over worker threads; the result is the same as on one.
 */
export async function analyzeData(
  fleetPath: string,
  dataPath: string,
  log: (line: string) => void,
  /** Optional observer per vehicle of each analysed piece of samples and its trips (see VehicleStream). */
  observe?: (v: VehicleModel) => ConstructorParameters<typeof VehicleStream>[1],
  options: DataOptions = {},
): Promise<AnalyzedData> {
  const ctx = loadContext(fleetPath, dataPath, options.map, options.max_line_bytes);
  const { files, bytes, skipped } = listDataFiles(dataPath);
  if (skipped.length)
    log(
      `skipped ${skipped.length} files that are neither tables nor candump logs: ${skipped.slice(0, 5).join(', ')}`,
    );
  const notes = new NoteMerger(log);
  const progress = progressReporter(bytes);
  const threads = observe
    ? 1
    : (options.threads ?? (bytes >= PARALLEL_MIN_BYTES && files.length > 1 ? availableParallelism() : 1));
  const plans = threads > 1 ? planJobs(files, ctx, threads) : [];
  let read: ReadResult;
  if (plans.length > 1) {
    read = await readInParallel(
      { fleetPath, dataPath, mapPath: options.map, max_line_bytes: options.max_line_bytes },
      ctx,
      plans,
      (n) => notes.add(n),
      (n, rows) => progress.bytes(n, rows),
    );
  } else {
    const reader = new DataReader(ctx, {
      observe,
      onBytes: (n) => progress.bytes(n, reader.rows),
    });
    for (const [i, f] of files.entries()) notes.add(reader.read(f, i));
    const { by_reason, unknown, frames, rows } = reader;
    read = { by_reason, unknown, frames, rows, outcomes: reader.finish(), spans: reader.audit.vehicleSpans };
  }
  progress.end();
  notes.end();
  if (read.unknown.size)
    log(`rows of vehicles not in the fleet file were skipped: ${[...read.unknown].slice(0, 10).join(', ')}`);
  const by_reason = { ...read.by_reason };
  const empty: StreamOutcome = { trips: [], rejected: {}, dropped: {}, received: 0 };
  const streams = new Map(ctx.models.map((m) => [m.id, read.outcomes.get(m.id) ?? empty]));
  for (const s of streams.values())
    for (const [k, n] of Object.entries(s.rejected)) by_reason[k] = (by_reason[k] ?? 0) + n;
  const total = Object.values(by_reason).reduce((a, b) => a + b, 0);
  if (read.rows === 0)
    throw new InputError([{ where: dataPath, rule: 'no usable rows in any file' }], 'nothing to analyse');
  return {
    vehicles: ctx.models,
    streams,
    rejected: { total, by_reason },
    rows: read.rows,
    frames: read.frames,
    whyNoTrips: (vehicle) => {
      const reasons = vehicleReasons(read.spans, vehicle);
      if (reasons.length) return `no usable samples: ${reasons.join('; ')}`;
      const received = streams.get(vehicle)?.received ?? 0;
      return received > 0 ? `${received} samples, but no trip in them` : 'no data for this vehicle';
    },
  };
}
