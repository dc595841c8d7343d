import type { TripResult, VehicleResult } from '@thermargin/shared';
import type Database from 'better-sqlite3';
import { SQLITE_DEFAULTS } from './sqlite.ts';
import { openSqliteFile } from './sqlite-open.ts';
import { createResultTables } from './sqlite-result-tables.ts';
import type { ResultsStore } from './store.ts';

/** Opens the results database (WAL, busy timeout): one connection per process role (analyzer, API). */
export function openResultsDb(path: string): Database.Database {
  if (path === ':memory:')
    throw new Error('openResultsDb: needs a file (each role opens its own connection)');
  return openSqliteFile(path, SQLITE_DEFAULTS);
}

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
}

export interface AnalysisStore extends ResultsStore {
  readAnalysis(vehicle: string): StoredAnalysis | undefined;
  readAnalyses(): StoredAnalysis[];
  /** vehicle → version, cheap: for cache checks. */
  versions(): Map<string, number>;
  version(vehicle: string): number | undefined;
  /** Runs `work` in one write transaction (BEGIN IMMEDIATE): read-modify-write without a lost update. */
  exclusive<T>(work: () => Promise<T>): Promise<T>;
  /** Writes results, vehicle summary and watermark atomically (inside `exclusive` or in its own). */
  commit(c: AnalysisCommit): Promise<void>;
}

/**
 * Results in SQLite (the trip_results / vehicle_results tables of sqlite-result-tables.ts, through its
 * ResultsStore), plus one row per vehicle of analysis state, all committed in one transaction so a
 * crash never leaves results without their watermark or the other way round.
 */
export function createAnalysisStore(db: Database.Database): AnalysisStore {
  const results = createResultTables(db);
  db.exec(`CREATE TABLE IF NOT EXISTS vehicle_analysis (
    vehicle TEXT PRIMARY KEY, analysed_to_ms INTEGER NOT NULL, version INTEGER NOT NULL,
    updated_ms INTEGER NOT NULL, json TEXT NOT NULL) WITHOUT ROWID`);
  const put = db.prepare(
    `INSERT INTO vehicle_analysis (vehicle, analysed_to_ms, version, updated_ms, json) VALUES (?, ?, 1, ?, ?)
     ON CONFLICT (vehicle) DO UPDATE SET analysed_to_ms = excluded.analysed_to_ms,
       version = version + 1, updated_ms = excluded.updated_ms, json = excluded.json`,
  );
  const selectOne = db.prepare('SELECT * FROM vehicle_analysis WHERE vehicle = ?');
  const selectAll = db.prepare('SELECT * FROM vehicle_analysis ORDER BY vehicle');
  const selectVersions = db.prepare('SELECT vehicle, version FROM vehicle_analysis').raw();
  const selectVersion = db.prepare('SELECT version FROM vehicle_analysis WHERE vehicle = ?').pluck();
  // The trip_results table belongs to sqlite-result-tables.ts; ResultsStore has no delete yet (see README).
  const deleteTrips = db.prepare('DELETE FROM trip_results WHERE vehicle = ? AND start >= ?');

  type Row = { vehicle: string; analysed_to_ms: number; version: number; updated_ms: number; json: string };
  const fromRow = (r: Row): StoredAnalysis => ({
    ...(JSON.parse(r.json) as Omit<StoredAnalysis, 'vehicle' | 'analysed_to_ms' | 'version' | 'updated_ms'>),
    vehicle: r.vehicle,
    analysed_to_ms: r.analysed_to_ms,
    version: r.version,
    updated_ms: r.updated_ms,
  });

  async function exclusive<T>(work: () => Promise<T>): Promise<T> {
    if (db.inTransaction) return work();
    db.exec('BEGIN IMMEDIATE');
    try {
      const out = await work();
      db.exec('COMMIT');
      return out;
    } catch (e) {
      if (db.inTransaction) db.exec('ROLLBACK');
      throw e;
    }
  }

  return {
    ...results,
    readAnalysis(vehicle) {
      const r = selectOne.get(vehicle) as Row | undefined;
      return r && fromRow(r);
    },
    readAnalyses() {
      return (selectAll.all() as Row[]).map(fromRow);
    },
    versions() {
      return new Map(selectVersions.all() as [string, number][]);
    },
    version(vehicle) {
      return selectVersion.get(vehicle) as number | undefined;
    },
    exclusive,
    commit(c) {
      return exclusive(async () => {
        if (c.delete_from_ms !== undefined)
          deleteTrips.run(c.vehicle, new Date(c.delete_from_ms).toISOString().replace(/\.000Z$/, 'Z'));
        await results.putTripResults(c.vehicle, c.trips);
        await results.putVehicleResult(c.result);
        const { analysed_to_ms, ...rest } = c.analysis;
        put.run(c.vehicle, Math.round(analysed_to_ms), Math.round(c.now_ms), JSON.stringify(rest));
      });
    },
    async close() {
      if (db.open) db.close();
    },
  };
}
