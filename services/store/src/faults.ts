import { accessSync, constants, existsSync, statfsSync } from 'node:fs';
import { dirname } from 'node:path';
import { FAULT_WORDS, faultKind, type StoreFaultKind } from '@thermargin/shared/store-faults';

/** Why a store cannot take writes (STORE_FAULTS, shared), and in words: what every part reports. */
export interface StoreFault {
  kind: StoreFaultKind;
  /** In words, with the system's own: `disk full (SQLITE_FULL: database or disk is full)`. */
  reason: string;
}

/** PostgreSQL SQLSTATEs of the server or its storage, not of the statement: connection (08), resources
 *  (53), operator intervention such as a shutdown (57), system (58), read-only, lock not available,
 *  a transaction cut off for idling (25P03). */
const POSTGRES_STORAGE = /^(08|53|57|58)[0-9A-Z]{3}$|^25006$|^55P03$|^25P03$/;

/** Whether `e` came from the storage itself (a SQLite result code, a PostgreSQL server state, a
 *  file-system errno, a check of ours) rather than from a mistake in what was asked of it. */
export function isStorageError(e: unknown): boolean {
  if (e instanceof StoreFaultError) return true;
  const code = (e as { code?: unknown })?.code;
  return typeof code === 'string' && (/^SQLITE_|^E[A-Z]+$/.test(code) || POSTGRES_STORAGE.test(code));
}

/** The database an error came from, by its code: SQLite's result codes, PostgreSQL's SQLSTATEs
 *  (its errors carry a severity); undefined for a file-system error or one without a code. */
export function storeEngine(e: unknown): 'sqlite' | 'postgres' | undefined {
  const err = e as { code?: unknown; severity?: unknown };
  if (typeof err?.code !== 'string') return undefined;
  if (err.code.startsWith('SQLITE_')) return 'sqlite';
  if (/^[0-9A-Z]{5}$/.test(err.code) && typeof err.severity === 'string') return 'postgres';
  return undefined;
}

/** What a storage error means: its kind and its words (the error's own code and message kept). */
export function storeFault(e: unknown): StoreFault {
  const err = e as { code?: unknown; message?: unknown };
  const code = typeof err?.code === 'string' ? err.code : '';
  const message = typeof err?.message === 'string' ? err.message : String(e);
  if (e instanceof StoreFaultError) return e.fault;
  // An error that wraps the storage's own (an HTTP 503 made of it): what the storage said.
  if (e instanceof Error && e.cause !== undefined && isStorageError(e.cause)) return storeFault(e.cause);
  const kind = faultKind(code);
  // PostgreSQL's SQLSTATE is said as such: a bare "53100" means nothing to a reader.
  const said = storeEngine(e) === 'postgres' ? `SQLSTATE ${code}` : code;
  const own = !code || message.startsWith(code) ? message : `${said}: ${message}`;
  return { kind, reason: `${FAULT_WORDS[kind]} (${own})` };
}

/** An error that carries its fault (thrown by the stores' own checks). */
export class StoreFaultError extends Error {
  constructor(readonly fault: StoreFault) {
    super(fault.reason);
  }
}

/** bytes, 8 MiB: a SQLite file's disk with less free is reported full (writes fail at any moment). */
export const MIN_FREE_BYTES = 8 * 2 ** 20;

/**
 * Whether the SQLite file at `path` can take writes, checked on the file system (not by writing): its
 * folder and file writable, and enough free space. Undefined when it can, else the fault naming the path.
 */
export function sqliteWritable(path: string): StoreFault | undefined {
  const dir = dirname(path);
  for (const target of existsSync(path) ? [dir, path] : [dir]) {
    try {
      accessSync(target, constants.W_OK);
    } catch (e) {
      const f = storeFault(e);
      return {
        kind: f.kind,
        reason: `${FAULT_WORDS[f.kind]}: ${target} (${(e as NodeJS.ErrnoException).code})`,
      };
    }
  }
  const fs = statfsSync(dir);
  const free = fs.bavail * fs.bsize;
  if (free < MIN_FREE_BYTES)
    return { kind: 'disk_full', reason: `disk full: ${free} bytes free on the disk of ${dir}` };
  return undefined;
}

/** What to do about a fault of a SQLite file, for a start-up error. */
export function remedy(kind: StoreFaultKind, path: string): string {
  const dir = dirname(path);
  if (kind === 'read_only')
    return `make ${dir} writable for this user (remount it read-write, or chown/chmod it), or point the store elsewhere (STORE_SQLITE_PATH, RESULTS_SQLITE_PATH; THERMARGIN_DATA_DIR for npm start)`;
  if (kind === 'disk_full') return `free space on the disk of ${dir}, or point the store at another disk`;
  if (kind === 'locked') return `stop the other process that holds ${path} open for writing`;
  return `check that ${dir} exists and ${path} is a SQLite file`;
}
