import { sliceColumns, type TripResult } from '@thermargin/shared';
import type { SampleStore, VehicleSpan } from '@thermargin/store';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { startsTrip, tripGoingOn } from '@thermargin/core/trip/split';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import type { AnalysisProgress } from '@thermargin/usecases/commit';
import type { AnalyzerOptions } from './options.ts';

export interface CatchUp {
  /** Trips that ended since the watermark, in time order. */
  trips: TripResult[];
  samples: number;
  state: AnalysisProgress;
}

const add = (into: Record<string, number>, from: Record<string, number>) => {
  for (const [k, n] of Object.entries(from)) into[k] = (into[k] ?? 0) + n;
};

/**
 * Analyses one vehicle's ended trips after the watermark: reads the store in large time ranges and
 * runs the core on each range at once. A trip has ended when another started after it (new trip id or
 * a gap of `trip_gap_s`) or when no sample came for `trip_gap_s` by the injected clock; the last
 * unfinished trip stays for the next run. A trip whose id continues after the watermark is re-read whole.
 */
export async function catchUpVehicle(
  samples: SampleStore,
  model: VehicleModel,
  span: VehicleSpan,
  start: AnalysisProgress,
  now_ms: number,
  o: AnalyzerOptions,
): Promise<CatchUp> {
  const state: AnalysisProgress = { ...start, rejected: { ...start.rejected } };
  const trips: TripResult[] = [];
  let from = state.analysed_to_ms;
  let chunk_ms = o.chunk_ms;
  let read = 0;
  while (from <= span.last_ms) {
    const to = Math.min(from + chunk_ms, span.last_ms + 1);
    const c = await samples.readSamples(model.id, from, to);
    const resumed = state.last_trip;
    if (
      c.n > 0 &&
      resumed &&
      c.trip[0] !== undefined &&
      c.trip[0] === resumed.trip &&
      from > resumed.start_ms
    ) {
      from = resumed.start_ms;
      state.previous_end_ms = resumed.previous_end_ms;
      state.last_trip = null;
      continue;
    }
    const more = to <= span.last_ms;
    let b = c.n - 1;
    while (b > 0 && !startsTrip(c, b, o.trip_gap_s)) b--;
    const open = c.n > 0 && (more || tripGoingOn(c.time_ms[c.n - 1]!, now_ms, o.trip_gap_s));
    const end = open ? Math.max(b, 0) : c.n;
    if (end === 0) {
      if (c.n > 0 && more) {
        chunk_ms *= 2; // one trip longer than the range: read further
        continue;
      }
      if (c.n === 0) from = to;
      if (!more) break;
      continue;
    }
    read += end;
    const r = analyzeVehicle(model, end === c.n ? c : sliceColumns(c, 0, end), {}, state.previous_end_ms);
    add(state.rejected, r.rejected.by_reason);
    const last = r.trips.at(-1);
    if (last) {
      const before = r.trips.at(-2);
      state.last_trip = {
        trip: last.trip,
        start_ms: Date.parse(last.start),
        previous_end_ms: before ? Date.parse(before.end) : state.previous_end_ms,
      };
      state.previous_end_ms = Date.parse(last.end);
    }
    trips.push(...r.trips);
    from = end === c.n ? to : c.time_ms[end]!;
    state.analysed_to_ms = from;
    chunk_ms = o.chunk_ms;
  }
  return { trips, samples: read, state };
}
