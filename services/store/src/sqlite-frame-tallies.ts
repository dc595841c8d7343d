import type Database from 'better-sqlite3';
import { FRAME_TALLY_COUNTS, type FrameTally, type FrameTotals, storedTime } from './store.ts';

/** The frame tallies of the SQLite store: one row per vehicle and batch start, replaced when written again. */
export function createFrameTallyTable(db: Database.Database) {
  const counts = FRAME_TALLY_COUNTS.join(', ');
  db.exec(`CREATE TABLE IF NOT EXISTS frame_tallies (
    vehicle TEXT NOT NULL, start_ms INTEGER NOT NULL, ${FRAME_TALLY_COUNTS.map((c) => `${c} INTEGER NOT NULL`).join(', ')},
    PRIMARY KEY (vehicle, start_ms)) WITHOUT ROWID`);
  const insert = db.prepare(
    `INSERT OR REPLACE INTO frame_tallies (vehicle, start_ms, ${counts})
     VALUES (@vehicle, @start_ms, ${FRAME_TALLY_COUNTS.map((c) => `@${c}`).join(', ')})`,
  );
  const totals = db.prepare(
    `SELECT vehicle, COUNT(*) AS batches, ${FRAME_TALLY_COUNTS.map((c) => `SUM(${c}) AS ${c}`).join(', ')}
     FROM frame_tallies GROUP BY vehicle ORDER BY vehicle`,
  );
  const deleteTallies = db.prepare('DELETE FROM frame_tallies WHERE start_ms < ?');
  return {
    /** One transaction for all of them. */
    write: db.transaction((tallies: readonly FrameTally[]) => {
      for (const t of tallies) insert.run({ ...t, start_ms: storedTime(t.start_ms) });
    }),
    totals: () => totals.all() as FrameTotals[],
    /** Inside the caller's transaction. */
    deleteBefore: (before_ms: number) => deleteTallies.run(before_ms),
  };
}
