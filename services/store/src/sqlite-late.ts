import type Database from 'better-sqlite3';
import type { LateMark } from './store.ts';

/**
 * Late-sample marks in SQLite: one row per vehicle, moved to the earliest late time and counted up by
 * every write that stores samples behind the vehicle's newest one (read before the write, inside its
 * transaction). A mark is cleared only if it is still as read (`id` = from:count), so a late write
 * landing between the analyzer's read and its clear is kept for the next pass.
 */
export function createSqliteLateMarks(db: Database.Database) {
  db.exec(`CREATE TABLE IF NOT EXISTS late_samples (
    vehicle TEXT PRIMARY KEY, from_ms INTEGER NOT NULL, count INTEGER NOT NULL) WITHOUT ROWID`);
  const upsert = db.prepare(
    `INSERT INTO late_samples (vehicle, from_ms, count) VALUES (?, ?, ?) ON CONFLICT (vehicle)
     DO UPDATE SET from_ms = MIN(from_ms, excluded.from_ms), count = count + excluded.count`,
  );
  const selectAll = db.prepare('SELECT vehicle, from_ms, count FROM late_samples ORDER BY vehicle');
  const remove = db.prepare('DELETE FROM late_samples WHERE vehicle = ? AND from_ms = ? AND count = ?');
  const clear = db.transaction((marks: readonly LateMark[]) => {
    for (const m of marks) remove.run(m.vehicle, m.from_ms, m.count);
  });
  return {
    /** `times` sorted, about to be written; `newest_ms` the vehicle's newest stored sample before them. */
    note(vehicle: string, times: Float64Array, newest_ms: number | null): void {
      if (newest_ms === null || !(times[0]! < newest_ms)) return;
      let n = 0;
      while (n < times.length && times[n]! < newest_ms) n++;
      upsert.run(vehicle, times[0], n);
    },
    read(): LateMark[] {
      return (selectAll.all() as Omit<LateMark, 'id'>[]).map((m) => ({
        ...m,
        id: `${m.from_ms}:${m.count}`,
      }));
    },
    clear,
  };
}
