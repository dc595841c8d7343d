import { DAY_MS } from '@thermargin/shared/time';

/** The UTC calendar day of an epoch-ms time (days since 1970-01-01). */
export const utcDay = (ms: number): number => Math.floor(ms / DAY_MS);

/**
 * Calendar days (UTC) an inspection date lies before `asof_ms` (0 when due earlier that day); null
 * when it is still ahead or there is no date. A projected date in the past reads as overdue, never as
 * a plan. Example: due 2026-07-21T08:14Z, as of 2026-07-31T06:00Z → 10.
 */
export function overdueDays(date: string | null, asof_ms: number): number | null {
  if (date === null) return null;
  const due = Date.parse(date);
  if (!Number.isFinite(due) || due > asof_ms) return null;
  return utcDay(asof_ms) - utcDay(due);
}
