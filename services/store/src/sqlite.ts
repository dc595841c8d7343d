import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { SIGNAL_NAMES, SIGNALS, type Sample, type SampleColumns, emptyColumns } from '@thermargin/shared';
import Database from 'better-sqlite3';
import { createSqliteResults } from './sqlite-results.ts';
import {
  type DeadLetter,
  type DeadLetterCount,
  type DeadLetterQuery,
  type ResultsStore,
  type SampleStore,
  type VehicleSpan,
  storedTime,
} from './store.ts';

export const SQLITE_DEFAULTS = {
  /** 'full' syncs the WAL on every commit (an acknowledged write survives power loss); 'normal' only
   *  survives a process crash, and is several times faster on slow disks. */
  synchronous: 'full' as 'full' | 'normal',
  /** ms: how long a writer waits for another connection's lock. */
  busy_timeout_ms: 5000,
};

export interface SqliteStoreOptions {
  /** File path, or ':memory:' (tests). The directory is created. */
  path: string;
  synchronous?: 'full' | 'normal';
  busy_timeout_ms?: number;
}

/** Signal columns in table order: the SIGNALS table is the one source. */
const COLUMNS = ['vehicle', 'time_ms', 'trip', ...SIGNAL_NAMES] as const;

function schemaSql(): string {
  const signals = SIGNAL_NAMES.map((n) => `${n} REAL${SIGNALS[n].required ? ' NOT NULL' : ''}`).join(', ');
  // Clustered on (vehicle, time): a trip read is one contiguous range (see the ceilings doc).
  return `
    CREATE TABLE IF NOT EXISTS samples (
      vehicle TEXT NOT NULL, time_ms INTEGER NOT NULL, trip TEXT, ${signals},
      PRIMARY KEY (vehicle, time_ms)) WITHOUT ROWID;
    CREATE TABLE IF NOT EXISTS dead_letters (
      id INTEGER PRIMARY KEY, received_ms INTEGER NOT NULL, vehicle TEXT NOT NULL, reason TEXT NOT NULL,
      detail TEXT NOT NULL, topic TEXT NOT NULL, excerpt TEXT NOT NULL, payload_bytes INTEGER NOT NULL);
    CREATE INDEX IF NOT EXISTS dead_letters_by_time ON dead_letters (received_ms);`;
}

export type SqliteStore = SampleStore & ResultsStore;

export function createSqliteStore(options: SqliteStoreOptions): SqliteStore {
  const o = { ...SQLITE_DEFAULTS, ...options };
  if (o.path !== ':memory:') mkdirSync(dirname(o.path), { recursive: true });
  const db = new Database(o.path);
  db.pragma('journal_mode = WAL');
  db.pragma(`synchronous = ${o.synchronous === 'full' ? 'FULL' : 'NORMAL'}`);
  db.pragma(`busy_timeout = ${Math.round(o.busy_timeout_ms)}`);
  db.exec(schemaSql());

  const insertSample = db.prepare(
    `INSERT OR REPLACE INTO samples (${COLUMNS.join(', ')}) VALUES (${COLUMNS.map(() => '?').join(', ')})`,
  );
  const values = new Array<unknown>(COLUMNS.length);
  const writeSamples = db.transaction((samples: readonly Sample[]) => {
    for (const s of samples) {
      values[0] = s.vehicle;
      values[1] = storedTime(s.time_ms);
      values[2] = s.trip ?? null;
      for (let i = 0; i < SIGNAL_NAMES.length; i++) values[i + 3] = s[SIGNAL_NAMES[i]!] ?? null;
      insertSample.run(values);
    }
  });
  const selectRange = db
    .prepare(
      `SELECT time_ms, trip, ${SIGNAL_NAMES.join(', ')} FROM samples
       WHERE vehicle = ? AND time_ms >= ? AND time_ms < ? ORDER BY time_ms`,
    )
    .raw();
  const selectSpans = db.prepare(
    `SELECT vehicle, MIN(time_ms) AS first_ms, MAX(time_ms) AS last_ms, COUNT(*) AS count
     FROM samples GROUP BY vehicle ORDER BY vehicle`,
  );
  const selectLatest = db.prepare(
    `SELECT s.* FROM samples s JOIN (SELECT vehicle, MAX(time_ms) AS t FROM samples GROUP BY vehicle) m
     ON s.vehicle = m.vehicle AND s.time_ms = m.t ORDER BY s.vehicle`,
  );
  const insertLetter = db.prepare(
    `INSERT INTO dead_letters (received_ms, vehicle, reason, detail, topic, excerpt, payload_bytes)
     VALUES (@received_ms, @vehicle, @reason, @detail, @topic, @excerpt, @payload_bytes)`,
  );
  const writeLetters = db.transaction((letters: readonly DeadLetter[]) => {
    for (const l of letters) insertLetter.run({ ...l, received_ms: storedTime(l.received_ms) });
  });
  const countLetters = db.prepare(
    'SELECT vehicle, reason, COUNT(*) AS count FROM dead_letters GROUP BY vehicle, reason ORDER BY vehicle, reason',
  );
  const deleteSamples = db.prepare('DELETE FROM samples WHERE time_ms < ?');
  const deleteLetters = db.prepare('DELETE FROM dead_letters WHERE received_ms < ?');
  const results = createSqliteResults(db);
  let open = true;

  return {
    kind: 'sqlite',
    async writeSamples(samples) {
      if (samples.length > 0) writeSamples(samples);
    },
    async readSamples(vehicle, from_ms, to_ms) {
      const rows = selectRange.all(vehicle, from_ms, to_ms) as unknown[][];
      return rowsToColumns(rows);
    },
    async listVehicles() {
      return selectSpans.all() as VehicleSpan[];
    },
    async latestSamples() {
      return (selectLatest.all() as Record<string, unknown>[]).map(rowToSample);
    },
    async writeDeadLetters(letters) {
      if (letters.length > 0) writeLetters(letters);
    },
    async readDeadLetters(query: DeadLetterQuery = {}) {
      const where: string[] = [];
      const params: unknown[] = [];
      for (const key of ['vehicle', 'reason'] as const) {
        if (query[key] === undefined) continue;
        where.push(`${key} = ?`);
        params.push(query[key]);
      }
      const sql = `SELECT received_ms, vehicle, reason, detail, topic, excerpt, payload_bytes FROM dead_letters
        ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY received_ms DESC, id DESC LIMIT ?`;
      return db.prepare(sql).all(...params, query.limit ?? 100) as DeadLetter[];
    },
    async countDeadLetters() {
      return countLetters.all() as DeadLetterCount[];
    },
    async deleteBefore(before_ms) {
      db.transaction(() => {
        deleteSamples.run(before_ms);
        deleteLetters.run(before_ms);
      })();
    },
    async ping() {
      db.prepare('SELECT 1').get();
    },
    ...results,
    async close() {
      if (open) db.close();
      open = false;
    },
  };
}

function rowsToColumns(rows: unknown[][]): SampleColumns {
  const c = emptyColumns(rows.length);
  rows.forEach((row, i) => {
    c.time_ms[i] = row[0] as number;
    c.trip[i] = (row[1] as string | null) ?? undefined;
    for (let j = 0; j < SIGNAL_NAMES.length; j++)
      c[SIGNAL_NAMES[j]!][i] = (row[j + 2] as number | null) ?? Number.NaN;
  });
  return c;
}

function rowToSample(row: Record<string, unknown>): Sample {
  const s: Record<string, unknown> = { time_ms: row.time_ms, vehicle: row.vehicle };
  if (row.trip !== null) s.trip = row.trip;
  for (const n of SIGNAL_NAMES) if (row[n] !== null) s[n] = row[n];
  return s as unknown as Sample;
}
