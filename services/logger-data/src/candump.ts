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
}

export function newParsedFrame(): ParsedFrame {
  return { time_us: 0, id: 0, length: 0, data: new Uint8Array(8), why: '' };
}

const CAN_ERR_FLAG = 0x2000_0000;

/** Value of each hex digit byte, −1 for any other byte. */
const HEX = Int8Array.from({ length: 256 }, (_, c) =>
  c >= 48 && c <= 57 ? c - 48 : c >= 65 && c <= 70 ? c - 55 : c >= 97 && c <= 102 ? c - 87 : -1,
);
const hex = (c: number) => HEX[c]!;

const isSpace = (c: number) => c === 32 || c === 9;

/** Parses the Latin-1 bytes s[a, b) (without the line end) into `f`; returns one of the LINE_ codes. */
export function parseCandumpLine(s: Uint8Array, a: number, b: number, f: ParsedFrame): number {
  while (a < b && isSpace(s[a]!)) a++;
  while (b > a && (isSpace(s[b - 1]!) || s[b - 1] === 13)) b--;
  if (a === b) return LINE_BLANK;
  if (s[a] !== 40) return fail(f, LINE_BAD, 'does not start with "(seconds.microseconds)"');
  let i = a + 1;
  let sec = 0;
  let digits = 0;
  for (; i < b && s[i]! >= 48 && s[i]! <= 57; i++, digits++) sec = sec * 10 + s[i]! - 48;
  if (digits === 0 || digits > 12 || s[i] !== 46)
    return fail(f, LINE_BAD, 'the time is not seconds.microseconds');
  let frac = 0;
  let scale = 1e6;
  for (i++, digits = 0; i < b && s[i]! >= 48 && s[i]! <= 57; i++, digits++) {
    frac = frac * 10 + s[i]! - 48;
    scale /= 10;
  }
  if (digits === 0 || digits > 9 || s[i] !== 41)
    return fail(f, LINE_BAD, 'the time is not seconds.microseconds');
  f.time_us = sec * 1e6 + Math.round(frac * scale);
  i++;
  if (i >= b || !isSpace(s[i]!)) return fail(f, LINE_BAD, 'no interface after the time');
  while (i < b && isSpace(s[i]!)) i++;
  const iface = i;
  while (i < b && !isSpace(s[i]!)) i++;
  if (i === iface || i >= b) return fail(f, LINE_BAD, 'no frame after the interface');
  while (i < b && isSpace(s[i]!)) i++;
  let id = 0;
  const idStart = i;
  for (let h = 0; i < b && (h = hex(s[i]!)) >= 0; i++) id = id * 16 + h;
  const idDigits = i - idStart;
  if (s[i] !== 35)
    return fail(
      f,
      LINE_BAD,
      i < b && idDigits > 0
        ? `"${String.fromCharCode(s[i]!)}" in the identifier`
        : 'no "#" after the identifier',
    );
  if (idDigits === 8) {
    if (id & CAN_ERR_FLAG) return fail(f, LINE_NO_DATA, 'error frame');
    if (id > 0x1fff_ffff) return fail(f, LINE_BAD, `identifier ${id.toString(16)} is over 29 bits`);
    id = (id | CAN_EXTENDED) >>> 0;
  } else if (idDigits !== 3 || id > 0x7ff)
    return fail(f, LINE_BAD, 'the identifier is neither 3 nor 8 hex digits');
  i++;
  if (s[i] === 35) return fail(f, LINE_NO_DATA, 'CAN FD frame');
  if (s[i] === 82 || s[i] === 114) return fail(f, LINE_NO_DATA, 'remote frame');
  let n = 0;
  while (i < b && !isSpace(s[i]!) && s[i] !== 95) {
    const hi = hex(s[i]!);
    const lo = i + 1 < b ? hex(s[i + 1]!) : -1;
    if (hi < 0) return fail(f, LINE_BAD, 'the data is not hex');
    if (lo < 0) {
      const cut = i + 1 >= b || isSpace(s[i + 1]!) || s[i + 1] === 95;
      return fail(f, LINE_BAD, cut ? 'odd number of hex digits in the data' : 'the data is not hex');
    }
    if (n === 8) return fail(f, LINE_BAD, 'more than 8 data bytes');
    f.data[n++] = hi * 16 + lo;
    i += 2;
  }
  if (s[i] === 95) for (i++; i < b && hex(s[i]!) >= 0; i++); // `_` + length code of a padded frame
  while (i < b && isSpace(s[i]!)) i++;
  if (i < b && (s[i] === 84 || s[i] === 82) && i + 1 === b) i++; // direction flag
  if (i !== b) return fail(f, LINE_BAD, 'text after the frame');
  f.id = id;
  f.length = n;
  return LINE_FRAME;
}

function fail(f: ParsedFrame, kind: number, why: string): number {
  f.why = why;
  return kind;
}

const CANDUMP_LINE = /^\s*\(\d+\.\d+\)\s+\S+\s+[0-9A-Fa-f]{3,8}#/;

/** Whether a file's first lines read as a `candump -l` log (detected by content, not by name). */
export function looksLikeCandump(head: string): boolean {
  const first = head.split('\n').find((l) => l.trim() !== '');
  return first !== undefined && CANDUMP_LINE.test(first);
}
