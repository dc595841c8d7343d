/**
 * Why a store cannot take writes, as every part reports it: the stores classify their own errors with
 * these (services/store/src/faults.ts), the ingester and the API report the kind, `npm start` says it.
 */
export const STORE_FAULTS = ['disk_full', 'read_only', 'locked', 'io_error', 'unavailable'] as const;
export type StoreFaultKind = (typeof STORE_FAULTS)[number];

/** Each fault in words, for messages. */
export const FAULT_WORDS: Record<StoreFaultKind, string> = {
  disk_full: 'disk full',
  read_only: 'read-only',
  locked: 'locked by another process',
  io_error: 'input/output error',
  unavailable: 'not answering',
};

/**
 * A SQLite result code, PostgreSQL SQLSTATE or file-system errno value, by what it means for a writer.
 * SQLSTATEs after PostgreSQL 15's documentation, Appendix A "PostgreSQL Error Codes": 53100
 * disk_full, 25006 read_only_sql_transaction (a standby, or default_transaction_read_only), 55P03
 * lock_not_available, 58030 io_error; the rest (connection lost, shutting down) is "not answering".
 */
export function faultKind(code: string): StoreFaultKind {
  if (/^SQLITE_FULL|^ENOSPC$|^EDQUOT$|^53100$/.test(code)) return 'disk_full';
  if (/^SQLITE_READONLY|^EROFS$|^EACCES$|^EPERM$|^25006$/.test(code)) return 'read_only';
  if (/^SQLITE_BUSY|^SQLITE_LOCKED|^55P03$/.test(code)) return 'locked';
  if (/^SQLITE_IOERR|^EIO$|^58030$/.test(code)) return 'io_error';
  return 'unavailable';
}
