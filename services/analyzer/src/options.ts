import { TRIP_GAP_S } from '@thermargin/core/trip/split';

/** The analyzer's settings; defaults defined once here. */
export const ANALYZER_DEFAULTS = {
  /** ms, 10 000: how often the store is polled for new samples (`poke()` runs sooner). */
  poll_ms: 10_000,
  /** ms, 3 days: samples read per store call while catching up (≈ 260 000 at 1 Hz); doubled when one
   *  trip is longer, so a backlog is analysed in bulk, never trip by trip. */
  chunk_ms: 3 * 86_400_000,
  /** s, TRIP_GAP_S (300): a vehicle's last trip has ended when no sample came for this long. */
  trip_gap_s: TRIP_GAP_S,
};

export type AnalyzerOptions = typeof ANALYZER_DEFAULTS;
