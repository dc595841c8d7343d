import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import Database from 'better-sqlite3';
import { remedy, sqliteWritable, StoreFaultError, storeFault } from './faults.ts';

/**
 * Opens (creating) the SQLite file at `path` in WAL mode with the given sync level and busy timeout.
 * When that fails, or the file could only be read (SQLite falls back to read-only quietly), the error
 * names the file, the reason and what to do, instead of SQLite's "unable to open database file".
 */
export function openSqliteFile(
  path: string,
  o: { synchronous: 'full' | 'normal'; busy_timeout_ms: number },
): Database.Database {
  let db: Database.Database | undefined;
  try {
    if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true });
    db = new Database(path);
    db.pragma('journal_mode = WAL');
    db.pragma(`synchronous = ${o.synchronous === 'full' ? 'FULL' : 'NORMAL'}`);
    db.pragma(`busy_timeout = ${Math.round(o.busy_timeout_ms)}`);
    if (db.readonly) throw Object.assign(new Error('opened read-only'), { code: 'SQLITE_READONLY' });
    return db;
  } catch (e) {
    db?.close();
    const found = path === ':memory:' ? undefined : sqliteWritable(path);
    const f = found ?? storeFault(e);
    throw new StoreFaultError({
      kind: f.kind,
      reason: `cannot open the SQLite file ${path}: ${f.reason}; ${remedy(f.kind, path)}`,
    });
  }
}

/** ms, 250: how long `probeWrites` waits for the write lock before it calls the file locked. */
const LOCK_WAIT_MS = 250;

/**
 * Throws a StoreFaultError when the SQLite file `path` open as `db` could not take a write now: its
 * folder or file read-only, its disk (nearly) full, or its write lock held by another process.
 */
export function probeWrites(db: Database.Database, path: string, busy_timeout_ms: number): void {
  db.prepare('SELECT 1').get();
  if (path === ':memory:') return;
  const fault = sqliteWritable(path);
  if (fault) throw new StoreFaultError(fault);
  db.pragma(`busy_timeout = ${LOCK_WAIT_MS}`);
  try {
    db.exec('BEGIN IMMEDIATE');
    db.exec('ROLLBACK');
  } catch (e) {
    throw new StoreFaultError(storeFault(e));
  } finally {
    db.pragma(`busy_timeout = ${Math.round(busy_timeout_ms)}`);
  }
}
