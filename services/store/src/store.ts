import type { RejectReason, Sample, SampleColumns, TripResult, VehicleResult } from '@thermargin/shared';

/**
 * The storage interface every adapter implements (SQLite, InfluxDB). Times are epoch milliseconds,
 * stored to the millisecond (a fractional time is rounded). A sample is identified by vehicle + time:
 * writing it again replaces it, so redelivery and duplicates are harmless and order does not matter.
 */
export interface SampleStore {
  /** Which adapter, for logs and metrics ('sqlite', 'influx'). */
  readonly kind: string;
  /** Resolves once every sample is durably stored; rejects (storing none or some) when it cannot. */
  writeSamples(samples: readonly Sample[]): Promise<void>;
  /** One vehicle's samples with from_ms ≤ time < to_ms, sorted by time. */
  readSamples(vehicle: string, from_ms: number, to_ms: number): Promise<SampleColumns>;
  /** Every vehicle with samples, sorted by id. */
  listVehicles(): Promise<VehicleSpan[]>;
  /** The newest sample of each vehicle, sorted by vehicle. */
  latestSamples(): Promise<Sample[]>;
  writeDeadLetters(letters: readonly DeadLetter[]): Promise<void>;
  /** Newest first, at most `limit` (default 100). */
  readDeadLetters(query?: DeadLetterQuery): Promise<DeadLetter[]>;
  /** Counts per vehicle ('' when none was known) and reason. */
  countDeadLetters(): Promise<DeadLetterCount[]>;
  /**
   * Marks of samples written behind their vehicle's newest stored sample (late: their time may have
   * been analysed already), each with the earliest such time and how many. Every write leaves one when
   * it stores late samples; a vehicle may have several marks.
   */
  lateMarks(): Promise<LateMark[]>;
  /** Forgets exactly these marks (one that changed since it was read stays, to be read again). */
  clearLateMarks(marks: readonly LateMark[]): Promise<void>;
  /** Replaces the tallies given (key: vehicle + start_ms, so a redelivered batch counts once). */
  writeFrameTallies(tallies: readonly FrameTally[]): Promise<void>;
  /** Per vehicle, the sums of its frame tallies, sorted by vehicle. */
  frameTotals(): Promise<FrameTotals[]>;
  /** Deletes samples, dead letters and frame tallies older than `before_ms`. */
  deleteBefore(before_ms: number): Promise<void>;
  /**
   * Resolves when the store answers and can take writes; rejects with why not (for SQLite a
   * StoreFaultError: disk full, read-only, locked — faults.ts).
   */
  ping(): Promise<void>;
  close(): Promise<void>;
}

export interface VehicleSpan {
  vehicle: string;
  first_ms: number;
  last_ms: number;
  count: number;
}

export interface LateMark {
  vehicle: string;
  /** ms: the earliest late sample. */
  from_ms: number;
  /** Late samples written (a rewrite of a sample already stored counts too). */
  count: number;
  /** The adapter's handle for clearing this very mark. */
  id: string;
}

/** One refused message or sample, kept with what it was and why. */
export interface DeadLetter {
  /** ms: when the ingester received it. */
  received_ms: number;
  /** Vehicle from the topic (or sample) when one could be read, else ''. */
  vehicle: string;
  reason: RejectReason;
  /** Which rule, in words (`speed_kmh must be within 0…250`, `samples[3].time ...`). */
  detail: string;
  topic: string;
  /** The payload, or the offending sample, cut to `DEAD_LETTER_EXCERPT_BYTES`. */
  excerpt: string;
  /** bytes: size of the whole payload. */
  payload_bytes: number;
}

export const DEAD_LETTER_EXCERPT_BYTES = 2048;

/** The counts of a frame tally, in the order the stores keep them. */
export const FRAME_TALLY_COUNTS = [
  'frames',
  'decoded',
  'unknown_pgn',
  'not_available',
  'error_values',
  'samples',
  'incomplete',
] as const;
export type FrameTallyCount = (typeof FRAME_TALLY_COUNTS)[number];

/**
 * What one batch of CAN frames held for a vehicle, counted by the ingester: frames, those decoded, those
 * of PGNs nothing reads, parameter values sent as not available or error, samples built and those left
 * incomplete (a required signal missing). Keyed by vehicle and the batch's start.
 */
export type FrameTally = { vehicle: string; start_ms: number } & Record<FrameTallyCount, number>;
/** A vehicle's frame tallies summed, with how many batches they came from. */
export type FrameTotals = { vehicle: string; batches: number } & Record<FrameTallyCount, number>;

export interface DeadLetterQuery {
  vehicle?: string;
  reason?: RejectReason;
  limit?: number;
}

export interface DeadLetterCount {
  vehicle: string;
  reason: RejectReason;
  count: number;
}

/**
 * Where the analyzer's results live (trip results, vehicle health, alerts). Implemented by the SQLite
 * adapter; an InfluxDB deployment keeps results in SQLite beside it (see services/store/README.md),
 * since results are documents keyed by vehicle and trip, not time series.
 */
export interface ResultsStore {
  /** Replaces the trip results given (key: vehicle + trip). */
  putTripResults(vehicle: string, trips: readonly TripResult[]): Promise<void>;
  /** One vehicle's trip results, sorted by start. */
  readTripResults(vehicle: string): Promise<TripResult[]>;
  /** Replaces the vehicle's summary (health, status, cause, alerts; its `trips` are not kept here). */
  putVehicleResult(result: VehicleResult): Promise<void>;
  readVehicleResult(vehicle: string): Promise<VehicleResult | undefined>;
  /** Every vehicle summary, sorted by id, with its trips. */
  readVehicleResults(): Promise<VehicleResult[]>;
  close(): Promise<void>;
}

/** Time as the stores keep it: integer milliseconds. */
export function storedTime(time_ms: number): number {
  return Math.round(time_ms);
}

/** A UTF-8-safe prefix of `text` of at most `bytes` bytes. */
export function excerpt(text: string, bytes: number = DEAD_LETTER_EXCERPT_BYTES): string {
  if (text.length * 3 <= bytes) return text;
  const buf = Buffer.from(text.slice(0, bytes), 'utf8');
  if (buf.length <= bytes) return buf.toString('utf8');
  return buf
    .subarray(0, bytes)
    .toString('utf8')
    .replace(/\uFFFD$/, '');
}
