import { DAY_MS } from '@thermargin/shared/time';
import { TRIP_GAP_S } from '@thermargin/core/trip/split';

/** How stored samples are read and cut into analysed pieces: the analyzer's and the sizing input's. */
export const READ_DEFAULTS = {
  /** ms, 3 days: samples read per store call while catching up (≈ 260 000 at 1 Hz); doubled when one
   *  trip is longer, so a backlog is analysed in bulk, never trip by trip. */
  chunk_ms: 3 * DAY_MS,
  /** s, TRIP_GAP_S (300): a vehicle's last trip has ended when no sample came for this long. */
  trip_gap_s: TRIP_GAP_S,
};

export type ReadOptions = typeof READ_DEFAULTS;
