import type { TimeMap } from '@thermargin/shared';

/** Reads a time field from the Latin-1 bytes s[a, b) (trimmed) as epoch ms; NaN when it is not one. */
export type TimeReader = (s: Uint8Array, a: number, b: number) => number;

const text = (s: Uint8Array, a: number, b: number) =>
  Buffer.from(s.buffer, s.byteOffset + a, b - a).toString('latin1');

/** ISO 8601 with a date, a time and an offset (Z or ±hh[:mm]); without an offset the zone is unknown. */
const ISO_WITH_OFFSET = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}(:?\d{2})?)$/;

function isoReader(s: Uint8Array, a: number, b: number): number {
  const t = text(s, a, b);
  if (!ISO_WITH_OFFSET.test(t)) return Number.NaN;
  return Date.parse(t.replace(' ', 'T').replace(/([+-]\d{2})$/, '$1:00'));
}

/** A plain decimal number (digits, one dot, a sign) or NaN: epoch counts never need more. */
function plainNumber(s: Uint8Array, a: number, b: number): number {
  const t = text(s, a, b);
  return /^[+-]?\d+(\.\d+)?$/.test(t) ? Number(t) : Number.NaN;
}

/** ms per count of each epoch time form (seconds, milliseconds or microseconds since 1970). */
export const EPOCH_MS: Readonly<Partial<Record<TimeMap['form'], number>>> = {
  epoch_s: 1000,
  epoch_ms: 1,
  epoch_us: 0.001,
};

const epochReader =
  (ms_per_unit: number): TimeReader =>
  (s, a, b) =>
    plainNumber(s, a, b) * ms_per_unit;

/** Offset of `zone` from UTC at the instant `utc_ms`, in ms (Intl's time zone data, the IANA database). */
function zoneOffset_ms(format: Intl.DateTimeFormat, utc_ms: number): number {
  const p: Record<string, number> = {};
  for (const part of format.formatToParts(utc_ms))
    if (part.type !== 'literal') p[part.type] = Number(part.value);
  const wall = Date.UTC(p.year!, p.month! - 1, p.day!, p.hour! % 24, p.minute!, p.second!);
  return wall - Math.floor(utc_ms / 1000) * 1000;
}

const LOCAL = /^(\d{1,4})[-./](\d{1,2})[-./](\d{1,4})[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?$/;

/** ms: offsets are cached per quarter hour of wall-clock time (zones change offset on such boundaries). */
const OFFSET_BUCKET_MS = 15 * 60_000;
/** ms: a zone changes its offset at most once within this much either side of a time. */
const OFFSET_SPAN_MS = 12 * 3_600_000;

/**
 * Local wall-clock times in an IANA zone (`2024-06-01 14:03:22`, `01.06.2024 14:03:22` with date_order
 * dmy). A wall time skipped when the clocks go forward does not exist and is refused (NaN); one that occurs
 * twice when they go back is read as the first (earlier) of the two.
 */
function localReader(zone: string, order: 'ymd' | 'dmy' | 'mdy'): TimeReader {
  const format = new Intl.DateTimeFormat('en-US', {
    timeZone: zone,
    hourCycle: 'h23',
    year: 'numeric',
    month: 'numeric',
    day: 'numeric',
    hour: 'numeric',
    minute: 'numeric',
    second: 'numeric',
  });
  const offsets = new Map<number, number>();
  /** The offset that maps this wall time's quarter hour to UTC, the earlier reading first; NaN: none does. */
  const offsetOfWall = (wall: number): number => {
    const bucket = Math.floor(wall / OFFSET_BUCKET_MS);
    let off = offsets.get(bucket);
    if (off === undefined) {
      const w = bucket * OFFSET_BUCKET_MS;
      const a = zoneOffset_ms(format, w - OFFSET_SPAN_MS);
      const b = zoneOffset_ms(format, w + OFFSET_SPAN_MS);
      off = [Math.max(a, b), Math.min(a, b)].find((o) => zoneOffset_ms(format, w - o) === o) ?? Number.NaN;
      offsets.set(bucket, off);
    }
    return off;
  };
  return (s, a, b) => {
    const m = LOCAL.exec(text(s, a, b));
    if (!m) return Number.NaN;
    const n = m.slice(1, 4).map(Number) as [number, number, number];
    const [y, mo, d] = order === 'ymd' ? n : order === 'dmy' ? [n[2], n[1], n[0]] : [n[2], n[0], n[1]];
    const h = Number(m[4]);
    const mi = Number(m[5]);
    const sec = Number(m[6] ?? 0);
    const frac = m[7] ? Number(`0.${m[7]}`) * 1000 : 0;
    if (y < 1000 || mo < 1 || mo > 12 || d < 1 || d > 31 || h > 23 || mi > 59 || sec > 59) return Number.NaN;
    const wall = Date.UTC(y, mo - 1, d, h, mi, sec);
    if (new Date(wall).getUTCDate() !== d) return Number.NaN; // 31 June
    return wall - offsetOfWall(wall) + frac;
  };
}

/** The reader for a mapping's time form. */
export function timeReader(map: TimeMap): TimeReader {
  switch (map.form) {
    case 'iso8601':
      return isoReader;
    case 'epoch_s':
    case 'epoch_ms':
    case 'epoch_us':
      return epochReader(EPOCH_MS[map.form]!);
    case 'local':
      return localReader(map.zone!, map.date_order ?? 'ymd');
  }
}
