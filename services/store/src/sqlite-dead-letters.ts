import type Database from 'better-sqlite3';
import { type DeadLetter, type DeadLetterCount, type DeadLetterQuery, storedTime } from './store.ts';

/** The dead-letter table of the SQLite store: refused messages with why, indexed by receive time. */
export function createDeadLetterTable(db: Database.Database) {
  db.exec(`
    CREATE TABLE IF NOT EXISTS dead_letters (
      id INTEGER PRIMARY KEY, received_ms INTEGER NOT NULL, vehicle TEXT NOT NULL, reason TEXT NOT NULL,
      detail TEXT NOT NULL, topic TEXT NOT NULL, excerpt TEXT NOT NULL, payload_bytes INTEGER NOT NULL);
    CREATE INDEX IF NOT EXISTS dead_letters_by_time ON dead_letters (received_ms);`);
  const insertLetter = db.prepare(
    `INSERT INTO dead_letters (received_ms, vehicle, reason, detail, topic, excerpt, payload_bytes)
     VALUES (@received_ms, @vehicle, @reason, @detail, @topic, @excerpt, @payload_bytes)`,
  );
  const countLetters = db.prepare(
    'SELECT vehicle, reason, COUNT(*) AS count FROM dead_letters GROUP BY vehicle, reason ORDER BY vehicle, reason',
  );
  const deleteLetters = db.prepare('DELETE FROM dead_letters WHERE received_ms < ?');
  return {
    /** One transaction for all of them. */
    write: db.transaction((letters: readonly DeadLetter[]) => {
      for (const l of letters) insertLetter.run({ ...l, received_ms: storedTime(l.received_ms) });
    }),
    /** Newest first, at most `limit` (default 100); every value a bound parameter. */
    read(query: DeadLetterQuery = {}): DeadLetter[] {
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
    count: () => countLetters.all() as DeadLetterCount[],
    /** Inside the caller's transaction. */
    deleteBefore: (before_ms: number) => deleteLetters.run(before_ms),
  };
}
