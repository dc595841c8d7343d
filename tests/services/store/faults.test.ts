import { isStorageError, storeFault } from '@thermargin/store';
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
