import type Database from 'better-sqlite3';
import type { AnalysisStore, StoredAnalysis } from './analysis.ts';
import { SQLITE_DEFAULTS } from './sqlite.ts';
import { openSqliteFile } from './sqlite-open.ts';
import { createResultTables } from './sqlite-result-tables.ts';

/** Opens the results database (WAL, busy timeout): one connection per process role (analyzer, API). */
export function openResultsDb(path: string): Database.Database {
  if (path === ':memory:')
    throw new Error('openResultsDb: needs a file (each role opens its own connection)');
  return openSqliteFile(path, SQLITE_DEFAULTS);
}

export type { AnalysisCommit, AnalysisStore, StoredAnalysis } from './analysis.ts';

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

  // One connection, one writer at a time: BEGIN IMMEDIATE holds every vehicle.
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
    kind: 'sqlite',
    ...results,
    async readAnalysis(vehicle) {
      const r = selectOne.get(vehicle) as Row | undefined;
      return r && fromRow(r);
    },
    async readAnalyses() {
      return (selectAll.all() as Row[]).map(fromRow);
    },
    async versions() {
      return new Map(selectVersions.all() as [string, number][]);
    },
    async version(vehicle) {
      return selectVersion.get(vehicle) as number | undefined;
    },
    exclusive: (_vehicle, work) => exclusive(work),
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
