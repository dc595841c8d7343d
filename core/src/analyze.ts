import type { SampleColumns, TripResult } from '@thermargin/shared';
import { cleanSamples, type Rejections } from './trip/clean.ts';
import { ESTIMATOR_DEFAULTS, type EstimatorOptions } from './trip/estimator-options.ts';
import { analyzeTrip } from './trip/analyze-trip.ts';
import { splitTrips, type TripSpan } from './trip/split.ts';
import type { VehicleModel } from './vehicle/resolve.ts';

/** Samples as the analysis uses them: cleaned and time-sorted, cut into trips. */
export interface TripPieces {
  /** The cleaned columns (may be the input itself when cleaning dropped nothing). */
  columns: SampleColumns;
  /** The trips in `columns`, in time order. */
  spans: TripSpan[];
  rejections: Rejections;
}

export interface VehicleAnalysis {
  trips: TripResult[];
  rejected: { total: number; by_reason: Record<string, number> };
  /** Optional values dropped from kept samples, by reason. */
  dropped_values: Record<string, number>;
  /** What the trips were computed from: `spans[j]` of `cleaned` is `trips[j]` (for sizing's evidence). */
  cleaned: SampleColumns;
  spans: TripSpan[];
}

/** The analysis's first two steps, clean then split (any order in; `columns` changed as cleanSamples says). */
export function tripPieces(columns: SampleColumns): TripPieces {
  const { columns: c, rejections } = cleanSamples(columns);
  return { columns: c, spans: splitTrips(c), rejections };
}

/** Per-trip counts of cleaning rejections, by time span; rejections between trips go to none. */
function rejectionsByTrip(r: Rejections, starts: number[], ends: number[]): Record<string, number>[] {
  const out = starts.map(() => ({}) as Record<string, number>);
  let k = 0;
  for (const e of r.events) {
    while (k < ends.length && ends[k]! < e.time_ms) k++;
    if (k < starts.length && e.time_ms >= starts[k]!) out[k]![e.reason] = (out[k]![e.reason] ?? 0) + 1;
  }
  return out;
}

/**
 * The core computation for one vehicle: clean, split into trips, and analyse each trip.
 * `columns` may be in any order; it is not modified except that implausible optional values become NaN.
 */
export function analyzeVehicle(
  vehicle: VehicleModel,
  columns: SampleColumns,
  options: Partial<EstimatorOptions> = {},
  /** Epoch ms of the last sample before `columns` (when a long stream is analysed in pieces). */
  previousEnd_ms: number | null = null,
): VehicleAnalysis {
  const o: EstimatorOptions = { ...ESTIMATOR_DEFAULTS, ...options };
  const { columns: c, spans, rejections } = tripPieces(columns);
  const starts = spans.map((s) => c.time_ms[s.from]!);
  const ends = spans.map((s) => c.time_ms[s.to - 1]!);
  const perTrip = rejectionsByTrip(rejections, starts, ends);
  const trips = spans.map((span, j) =>
    analyzeTrip(c, span, vehicle, o, {
      previousEnd_ms: j > 0 ? ends[j - 1]! : previousEnd_ms,
      rejected: perTrip[j]!,
    }),
  );
  return {
    trips,
    rejected: { total: rejections.total, by_reason: rejections.by_reason },
    dropped_values: rejections.dropped_values,
    cleaned: c,
    spans,
  };
}
