import type { Status, TripResult } from '@thermargin/shared';

/** What one commit changed, numbered by that commit's change id. */
interface Change {
  id: number;
  /** Its place in its change (the trips in start order, then the status): with `id`, what a client
   *  resumes after. */
  index: number;
  vehicle: string;
}

/** A trip result as written by one commit. */
export interface TripChange extends Change {
  kind: 'trip';
  trip: TripResult;
}

/** A vehicle's status as one commit changed it (`from` null: its first). */
export interface StatusChange extends Change {
  kind: 'status';
  from: Status | null;
  to: Status;
  /** ISO time: the end of its newest trip (the status's time). */
  time: string;
}

export type ResultChange = TripChange | StatusChange;

/**
 * Every commit of results, by any process on any machine, numbered in the order it became visible
 * (postgres-changes.ts). The APIs' live events read it, so each replica tells its clients of every new
 * result, and a client that reconnects (to any replica) says the last change it saw and gets the rest.
 */
export interface ResultChanges {
  /** The newest committed change id (0 when none). */
  latest(): Promise<number>;
  /** Trip results and status changes of the commits after `after`, oldest first: at most `limit`
   *  whole changes. */
  since(after: number, limit?: number): Promise<ResultChange[]>;
  /** Calls `listener` after each commit anywhere, and once after a lost connection is back (changes
   *  may have come meanwhile). Returns the unsubscribe. */
  subscribe(listener: () => void): () => void;
  close(): Promise<void>;
}
