import type { SampleColumns } from '@thermargin/shared';

/** s, 300: a pause this long without samples ends a trip when the data carries no trip id. */
export const TRIP_GAP_S = 300;

export interface TripSpan {
  /** The data's trip id, or one made from the start time (`20260701T081500Z`). */
  trip: string;
  /** Index range [from, to) into time-sorted columns. */
  from: number;
  to: number;
}

/** Trip id made from a start time: compact ISO 8601 UTC basic format, safe as an id. */
export function tripIdFromTime(time_ms: number): string {
  return new Date(time_ms)
    .toISOString()
    .replace(/[-:]/g, '')
    .replace(/\.\d{3}/, '');
}

/** True when a vehicle whose last sample came at `last_ms` may still be on that trip at `now_ms`. */
export function tripGoingOn(last_ms: number, now_ms: number, gap_s = TRIP_GAP_S): boolean {
  return now_ms - last_ms < gap_s * 1000;
}

/** True when time-sorted sample i (i ≥ 1) starts a new trip. */
export function startsTrip(
  c: Pick<SampleColumns, 'trip' | 'time_ms'>,
  i: number,
  gap_s = TRIP_GAP_S,
): boolean {
  return (
    c.trip[i] !== c.trip[i - 1] ||
    (c.trip[i] === undefined && c.time_ms[i]! - c.time_ms[i - 1]! >= gap_s * 1000)
  );
}

/**
 * Splits time-sorted samples into trips: by `trip` where given (a change of id starts a new trip),
 * else on gaps of TRIP_GAP_S or more. Samples without an id between samples with one form their own trips.
 */
export function splitTrips(c: SampleColumns, gap_s = TRIP_GAP_S): TripSpan[] {
  const spans: TripSpan[] = [];
  let from = 0;
  for (let i = 1; i <= c.n; i++) {
    if (i < c.n && !startsTrip(c, i, gap_s)) continue;
    spans.push({ trip: c.trip[from] ?? tripIdFromTime(c.time_ms[from]!), from, to: i });
    from = i;
  }
  return spans;
}
