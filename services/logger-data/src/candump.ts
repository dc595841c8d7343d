import { CAN_EXTENDED } from '@thermargin/shared';

/**
 * One line of a SocketCAN log as Linux `candump -l` writes it (can-utils' log format):
 *   (1717230000.123456) can0 18FEEE00#7DFFFFFFFFFFFFFF
 * a time in seconds since the epoch in parentheses, the interface, then the frame: 3 hex digits for an
 * 11-bit identifier or 8 for a 29-bit one, `#`, and the data as 0–8 hex byte pairs. Remote frames
 * (`#R`), CAN FD frames (`##`) and error frames (identifier with bit 29, CAN_ERR_FLAG, set) are
 * legitimate lines that carry no parameters. A trailing `_` + data length code, or a direction flag
 * (`T`/`R`) after a space, are allowed.
 */
export const LINE_FRAME = 0;
export const LINE_BLANK = 1;
/** A valid line without data to read: remote, CAN FD or error frame. */
export const LINE_NO_DATA = 2;
export const LINE_BAD = 3;

/** The frame read from the last line (valid after LINE_FRAME). */
export interface ParsedFrame {
  time_us: number;
  id: number;
  length: number;
  /** 8 bytes, reused from line to line. */
  data: Uint8Array;
  /** Why the line is bad or has no data, in words. */
  why: string;
  /** Where the next line starts, and whether a line feed ended this one. */
  next: number;
  terminated: boolean;
}

export function newParsedFrame(): ParsedFrame {
  return { time_us: 0, id: 0, length: 0, data: new Uint8Array(8), why: '', next: 0, terminated: false };
}

const CAN_ERR_FLAG = 0x2000_0000;

/** Value of each hex digit byte, −1 for any other byte. */
const HEX = Int8Array.from({ length: 256 }, (_, c) =>
  c >= 48 && c <= 57 ? c - 48 : c >= 65 && c <= 70 ? c - 55 : c >= 97 && c <= 102 ? c - 87 : -1,
);
const isSpace = (c: number) => c === 32 || c === 9;
/** Space, tab or the CR of a CRLF line end. */
const isBlank = (c: number) => c === 32 || c === 9 || c === 13;
const LF = 10;

/**
 * Parses the line that starts at s[a] and ends at the first line feed or at `limit`, into `f`; returns
 * one of the LINE_ codes and sets `f.next` (where the next line starts) and `f.terminated` (a line feed
 * ended it: otherwise the line may go on in the next read). Finds the line's end as it parses, so a log
 * is read without a separate search per line.
 */
export function parseCandumpLine(s: Uint8Array, a: number, limit: number, f: ParsedFrame): number {
  let i = a;
  while (i < limit && isBlank(s[i]!)) i++;
  if (i === limit || s[i] === LF) return done(s, i, limit, f, LINE_BLANK);
  if (s[i] !== 40) return fail(s, i, limit, f, LINE_BAD, 'does not start with "(seconds.microseconds)"');
  i++;
  let sec = 0;
  let digits = 0;
  for (; i < limit && s[i]! >= 48 && s[i]! <= 57; i++, digits++) sec = sec * 10 + s[i]! - 48;
  if (digits === 0 || digits > 12 || s[i] !== 46)
    return fail(s, i, limit, f, LINE_BAD, 'the time is not seconds.microseconds');
  let frac = 0;
  let scale = 1e6;
  for (i++, digits = 0; i < limit && s[i]! >= 48 && s[i]! <= 57; i++, digits++) {
    frac = frac * 10 + s[i]! - 48;
    scale /= 10;
  }
  if (digits === 0 || digits > 9 || s[i] !== 41)
    return fail(s, i, limit, f, LINE_BAD, 'the time is not seconds.microseconds');
  f.time_us = sec * 1e6 + Math.round(frac * scale);
  i++;
  if (i >= limit || !isSpace(s[i]!)) return fail(s, i, limit, f, LINE_BAD, 'no interface after the time');
  while (i < limit && isSpace(s[i]!)) i++;
  const iface = i;
  while (i < limit && !isBlank(s[i]!) && s[i] !== LF) i++;
  if (i === iface || i >= limit || !isSpace(s[i]!))
    return fail(s, i, limit, f, LINE_BAD, 'no frame after the interface');
  while (i < limit && isSpace(s[i]!)) i++;
  let id = 0;
  const idStart = i;
  for (let h = 0; i < limit && (h = HEX[s[i]!]!) >= 0; i++) id = id * 16 + h;
  const idDigits = i - idStart;
  if (s[i] !== 35) {
    const inside = i < limit && idDigits > 0 && !isBlank(s[i]!) && s[i] !== LF;
    return fail(
      s,
      i,
      limit,
      f,
      LINE_BAD,
      inside ? `"${String.fromCharCode(s[i]!)}" in the identifier` : 'no "#" after the identifier',
    );
  }
  if (idDigits === 8) {
    if (id & CAN_ERR_FLAG) return fail(s, i, limit, f, LINE_NO_DATA, 'error frame');
    if (id > 0x1fff_ffff)
      return fail(s, i, limit, f, LINE_BAD, `identifier ${id.toString(16)} is over 29 bits`);
    id = (id | CAN_EXTENDED) >>> 0;
  } else if (idDigits !== 3 || id > 0x7ff)
    return fail(s, i, limit, f, LINE_BAD, 'the identifier is neither 3 nor 8 hex digits');
  i++;
  if (s[i] === 35) return fail(s, i, limit, f, LINE_NO_DATA, 'CAN FD frame');
  if (s[i] === 82 || s[i] === 114) return fail(s, i, limit, f, LINE_NO_DATA, 'remote frame');
  let n = 0;
  while (i < limit && !isBlank(s[i]!) && s[i] !== LF && s[i] !== 95) {
    const hi = HEX[s[i]!]!;
    const lo = i + 1 < limit ? HEX[s[i + 1]!]! : -1;
    if (hi < 0) return fail(s, i, limit, f, LINE_BAD, 'the data is not hex');
    if (lo < 0) {
      const next = s[i + 1]!;
      const cut = i + 1 >= limit || isBlank(next) || next === LF || next === 95;
      return fail(
        s,
        i,
        limit,
        f,
        LINE_BAD,
        cut ? 'odd number of hex digits in the data' : 'the data is not hex',
      );
    }
    if (n === 8) return fail(s, i, limit, f, LINE_BAD, 'more than 8 data bytes');
    f.data[n++] = hi * 16 + lo;
    i += 2;
  }
  if (s[i] === 95) for (i++; i < limit && HEX[s[i]!]! >= 0; i++); // `_` + length code of a padded frame
  while (i < limit && isBlank(s[i]!)) i++;
  if ((s[i] === 84 || s[i] === 82) && (i + 1 === limit || isBlank(s[i + 1]!) || s[i + 1] === LF)) {
    i++; // direction flag
    while (i < limit && isBlank(s[i]!)) i++;
  }
  if (i < limit && s[i] !== LF) return fail(s, i, limit, f, LINE_BAD, 'text after the frame');
  f.id = id;
  f.length = n;
  return done(s, i, limit, f, LINE_FRAME);
}

/** The line ends at s[i] (a line feed, or the limit): where the next one starts. */
function done(s: Uint8Array, i: number, limit: number, f: ParsedFrame, kind: number): number {
  f.terminated = i < limit && s[i] === LF;
  f.next = f.terminated ? i + 1 : limit;
  return kind;
}

/** A line that is not a frame: why, and where it ends. */
function fail(s: Uint8Array, i: number, limit: number, f: ParsedFrame, kind: number, why: string): number {
  f.why = why;
  const lf = s.indexOf(LF, i);
  return done(s, lf < 0 || lf >= limit ? limit : lf, limit, f, kind);
}

const CANDUMP_LINE = /^\s*\(\d+\.\d+\)\s+\S+\s+[0-9A-Fa-f]{3,8}#/;

/** Whether a file's first lines read as a `candump -l` log (detected by content, not by name). */
export function looksLikeCandump(head: string): boolean {
  const first = head.split('\n').find((l) => l.trim() !== '');
  return first !== undefined && CANDUMP_LINE.test(first);
}
