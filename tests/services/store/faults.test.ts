import { isStorageError, storeEngine, storeFault } from '@thermargin/store';
import { describe, expect, it } from 'vitest';

const err = (code: string, message: string) => Object.assign(new Error(message), { code });

describe('store faults in words', () => {
  it('names what SQLite result codes and file-system errors mean for a writer, keeping their words', () => {
    expect(storeFault(err('SQLITE_FULL', 'database or disk is full'))).toEqual({
      kind: 'disk_full',
      reason: 'disk full (SQLITE_FULL: database or disk is full)',
    });
    expect(storeFault(err('ENOSPC', 'ENOSPC: no space left on device, write')).reason).toBe(
      'disk full (ENOSPC: no space left on device, write)',
    );
    expect(storeFault(err('SQLITE_READONLY_DBMOVED', 'attempt to write a readonly database')).kind).toBe(
      'read_only',
    );
    expect(storeFault(err('EROFS', 'EROFS: read-only file system')).kind).toBe('read_only');
    expect(storeFault(err('SQLITE_BUSY', 'database is locked')).kind).toBe('locked');
    expect(storeFault(err('SQLITE_IOERR_WRITE', 'disk I/O error')).kind).toBe('io_error');
    expect(storeFault(new Error('connect ECONNREFUSED')).kind).toBe('unavailable');
  });

  it("names what PostgreSQL SQLSTATEs mean for a writer, and that they are PostgreSQL's", () => {
    // PostgreSQL 15 documentation, Appendix A "PostgreSQL Error Codes".
    const pgErr = (code: string, message: string) => Object.assign(err(code, message), { severity: 'ERROR' });
    expect(
      storeFault(pgErr('53100', 'could not extend file "base/16384/16397": No space left on device')),
    ).toEqual({
      kind: 'disk_full',
      reason: 'disk full (SQLSTATE 53100: could not extend file "base/16384/16397": No space left on device)',
    });
    const kinds = { '25006': 'read_only', '55P03': 'locked', '58030': 'io_error', '57P01': 'unavailable' };
    for (const [code, kind] of Object.entries(kinds))
      expect(storeFault(pgErr(code, '')).kind, code).toBe(kind);
    expect(storeEngine(pgErr('53100', ''))).toBe('postgres');
    expect(storeEngine(err('SQLITE_FULL', ''))).toBe('sqlite');
    expect(storeEngine(err('ENOSPC', ''))).toBeUndefined();
    for (const code of ['53100', '25006', '55P03', '57P01', '08006', '25P03'])
      expect(isStorageError(pgErr(code, '')), code).toBe(true);
    // A mistake in the statement is not the store's fault.
    for (const code of ['23505', '42P01', '22P02']) expect(isStorageError(pgErr(code, '')), code).toBe(false);
  });

  it('reads through an error made of a storage error (an HTTP 503 keeps it as its cause)', () => {
    const wrapped = Object.assign(new Error('sample store (sqlite): …'), {
      code: 'store_unavailable',
      cause: err('SQLITE_FULL', 'database or disk is full'),
    });
    expect(storeFault(wrapped).kind).toBe('disk_full');
    expect(isStorageError(wrapped)).toBe(false);
    expect(isStorageError(wrapped.cause)).toBe(true);
  });
});
