import { BLOCK_DEFAULTS } from './sqlite-blocks.ts';
import { createDeadLetterTable } from './sqlite-dead-letters.ts';
import { createFrameTallyTable } from './sqlite-frame-tallies.ts';
import { createSqliteLateMarks } from './sqlite-late.ts';
import { openSqliteFile, probeWrites } from './sqlite-open.ts';
import { createResultTables } from './sqlite-result-tables.ts';
import { createSampleTables } from './sqlite-samples.ts';
import type { ResultsStore, SampleStore } from './store.ts';

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
  /** Block size and compaction step (tests use small blocks). */
  blocks?: Partial<typeof BLOCK_DEFAULTS>;
}

export type SqliteStore = SampleStore & ResultsStore;

/**
 * The SQLite store: one file in WAL mode holding the sample tables (sqlite-samples.ts), the dead
 * letters (sqlite-dead-letters.ts), the frame tallies (sqlite-frame-tallies.ts) and the result tables
 * (sqlite-result-tables.ts).
 */
export function createSqliteStore(options: SqliteStoreOptions): SqliteStore {
  const o = { ...SQLITE_DEFAULTS, ...options };
  const db = openSqliteFile(o.path, o);
  const late = createSqliteLateMarks(db);
  const samples = createSampleTables(db, { ...BLOCK_DEFAULTS, ...options.blocks }, late.note);
  const letters = createDeadLetterTable(db);
  const tallies = createFrameTallyTable(db);
  const results = createResultTables(db);
  const deleteBefore = db.transaction((before_ms: number) => {
    samples.deleteBefore(before_ms);
    letters.deleteBefore(before_ms);
    tallies.deleteBefore(before_ms);
  });
  let open = true;

  return {
    kind: 'sqlite',
    async writeSamples(list) {
      if (list.length > 0) samples.write(list);
    },
    async readSamples(vehicle, from_ms, to_ms) {
      return samples.read(vehicle, from_ms, to_ms);
    },
    async listVehicles() {
      return samples.spans();
    },
    async latestSamples() {
      return samples.latest();
    },
    async writeDeadLetters(list) {
      if (list.length > 0) letters.write(list);
    },
    async readDeadLetters(query) {
      return letters.read(query);
    },
    async countDeadLetters() {
      return letters.count();
    },
    async lateMarks() {
      return late.read();
    },
    async clearLateMarks(marks) {
      late.clear(marks);
    },
    async writeFrameTallies(list) {
      if (list.length > 0) tallies.write(list);
    },
    async frameTotals() {
      return tallies.totals();
    },
    async deleteBefore(before_ms) {
      deleteBefore(before_ms);
    },
    async ping() {
      probeWrites(db, o.path, o.busy_timeout_ms);
    },
    ...results,
    async close() {
      if (open) db.close();
      open = false;
    },
  };
}
