import type { TripResult } from '@thermargin/shared';

/** A trip result as written by one commit, numbered by that commit's change id. */
export interface TripChange {
  id: number;
  /** Its place among the trips of its change (trips in start order): with `id`, what a client resumes after. */
  index: number;
  vehicle: string;
  trip: TripResult;
}

/**
 * Every commit of results, by any process on any machine, numbered in the order it became visible
 * (postgres-changes.ts). The APIs' live events read it, so each replica tells its clients of every new
 * result, and a client that reconnects (to any replica) says the last change it saw and gets the rest.
 */
export interface ResultChanges {
  /** The newest committed change id (0 when none). */
  latest(): Promise<number>;
  /** Trip results written by the changes after `after`, oldest first: at most `limit` whole changes. */
  tripsSince(after: number, limit?: number): Promise<TripChange[]>;
  /** Calls `listener` after each commit anywhere, and once after a lost connection is back (changes
   *  may have come meanwhile). Returns the unsubscribe. */
  subscribe(listener: () => void): () => void;
  close(): Promise<void>;
}
