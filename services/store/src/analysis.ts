import type { TripResult, VehicleResult } from '@thermargin/shared';
import type { Lease } from './leases.ts';
import type { ResultsStore } from './store.ts';

/** Per vehicle: how far the analyzer got, and what the health module gave beyond the VehicleResult. */
export interface StoredAnalysis {
  vehicle: string;
  /** ms: every sample with time < this has been analysed (the watermark). */
  analysed_to_ms: number;
  /** ms: end of the last analysed trip (the next trip's soak-offset context); null before any trip. */
  previous_end_ms: number | null;
  /** The last analysed trip's id, start and the end of the trip before it, so a trip that resumes
   *  after the watermark is re-read whole. */
  last_trip: { trip: string; start_ms: number; previous_end_ms: number | null } | null;
  /** Cleaning rejections of the analysed samples, by reason (cumulative). */
  rejected: Record<string, number>;
  /** The health module's chart series, notes and candidates (JSON as the core gave them). */
  assessment: unknown;
  /** Bumped on every commit: readers cache by it. */
  version: number;
  updated_ms: number;
}

export interface AnalysisCommit {
  vehicle: string;
  /** Trip results to write (replacing same vehicle + trip). */
  trips: readonly TripResult[];
  /** Trip results of this vehicle starting at or after this time are removed first (re-analysis). */
  delete_from_ms?: number;
  result: VehicleResult;
  analysis: Omit<StoredAnalysis, 'vehicle' | 'version' | 'updated_ms'>;
  now_ms: number;
  /**
   * An analyzer replica's commit: refused (LeaseLostError, WatermarkMovedError; nothing written) unless
   * `lease` is still held and the stored watermark is still `from_ms` (null: none stored), and recorded
   * in the analysis log. Ignored by SQLite, which has one analyzer.
   */
  fence?: { lease: Lease; from_ms: number | null };
}

/**
 * Results plus one row per vehicle of analysis state, committed together so a crash never leaves
 * results without their watermark or the other way round. Implemented on SQLite (sqlite-analysis-store.ts)
 * and PostgreSQL (postgres-analysis.ts); tests/services/store/results-contract.ts holds both to it.
 */
export interface AnalysisStore extends ResultsStore {
  /** The database it is kept in, for messages about it. */
  readonly kind: 'sqlite' | 'postgres';
  readAnalysis(vehicle: string): Promise<StoredAnalysis | undefined>;
  readAnalyses(): Promise<StoredAnalysis[]>;
  /** vehicle → version, cheap: for cache checks. */
  versions(): Promise<Map<string, number>>;
  version(vehicle: string): Promise<number | undefined>;
  /**
   * Runs `work` in one write transaction holding `vehicle` against every other writer, so a
   * read-modify-write of its results loses no update. Every store call made inside `work` belongs
   * to the transaction. Writers of other vehicles may run at the same time (PostgreSQL) or wait (SQLite).
   */
  exclusive<T>(vehicle: string, work: () => Promise<T>): Promise<T>;
  /** Writes results, vehicle summary and watermark atomically (inside `exclusive` or in its own). */
  commit(c: AnalysisCommit): Promise<void>;
}
