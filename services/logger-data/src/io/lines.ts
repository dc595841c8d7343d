import { closeSync, openSync, readSync } from 'node:fs';
import { InputError } from '@thermargin/shared';

/** bytes read per system call: few large reads win on these machines (≈ 1 µs per call). */
export const READ_BYTES = 4 << 20;

/**
 * bytes, 1 MiB (`--max-line-bytes`): the longest line of a data file (table or candump log) read; a
 * longer one (a file without line breaks, a runaway field) ends the file with exit 2 at its file:line,
 * and memory stays at the read buffer. A row of every signal takes about 200 bytes; exports with many
 * extra columns, a few KiB; a candump line under 100.
 */
export const MAX_LINE_BYTES = 1 << 20;

/** The refusal of a line over the limit, naming it: the same for every reader of data files. */
export function lineTooLong(file: string, line: number, max: number): InputError {
  return new InputError(
    [
      {
        where: `${file}:${line}`,
        rule: `line longer than ${max} bytes (no line break within it); if the file is right, raise --max-line-bytes`,
      },
    ],
    `${file} has a line over the limit`,
  );
}

/** `buf` with room after its first `kept` bytes: twice as large when a line filled it (a limit over READ_BYTES). */
export function roomFor(buf: Buffer<ArrayBuffer>, kept: number): Buffer<ArrayBuffer> {
  if (kept < buf.length) return buf;
  const bigger = Buffer.allocUnsafe(buf.length * 2);
  buf.copy(bigger, 0, 0, kept);
  return bigger;
}

/**
 * Receives each line as bytes s[start, end) without its line end (\n or \r\n), with its 1-based number
 * and whether it holds a double quote (for delimited tables: most hold none, so they skip quote rules).
 */
export type LineVisitor = (s: Buffer, start: number, end: number, line: number, quoted: boolean) => void;

/**
 * Reads a file line by line from large chunks, handing out byte ranges (no string per line). Memory
 * stays at one chunk whatever the file's size. Throws InputError when the file cannot be opened or a
 * line exceeds `max_line_bytes` (naming the line).
 */
export function forEachLine(
  file: string,
  visit: LineVisitor,
  onBytes?: (n: number) => void,
  max_line_bytes = MAX_LINE_BYTES,
): number {
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch {
    throw new InputError([{ where: file, rule: 'cannot open the file' }]);
  }
  let buf = Buffer.allocUnsafe(READ_BYTES);
  let kept = 0;
  let line = 0;
  const take = (s: Buffer, start: number, nl: number, quoted: boolean) => {
    if (nl - start > max_line_bytes) throw lineTooLong(file, line + 1, max_line_bytes);
    visit(s, start, nl > start && s[nl - 1] === 13 ? nl - 1 : nl, ++line, quoted);
  };
  try {
    for (;;) {
      buf = roomFor(buf, kept);
      const n = readSync(fd, buf, kept, buf.length - kept, null);
      if (n === 0) break;
      const s = buf.subarray(0, kept + n);
      let start = 0;
      // Searched once per chunk, not per line: most files hold no quote at all.
      let quote = s.indexOf(34);
      for (let nl = s.indexOf(10); nl >= 0; nl = s.indexOf(10, start)) {
        if (quote >= 0 && quote < start) quote = s.indexOf(34, start);
        take(s, start, nl, quote >= 0 && quote < nl);
        start = nl + 1;
      }
      kept = s.length - start;
      if (kept > max_line_bytes) throw lineTooLong(file, line + 1, max_line_bytes);
      buf.copyWithin(0, start, s.length);
      onBytes?.(n);
    }
  } finally {
    closeSync(fd);
  }
  if (kept > 0) take(buf, 0, kept, buf.subarray(0, kept).includes(34));
  return line;
}

/** A file's first `bytes` as Latin-1 text, to tell its kind or dialect from; a file that will not open is named. */
export function readHead(file: string, bytes: number): string {
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch {
    throw new InputError([{ where: file, rule: 'cannot open the file' }]);
  }
  try {
    const buf = Buffer.allocUnsafe(bytes);
    return buf.toString('latin1', 0, readSync(fd, buf, 0, bytes, 0));
  } finally {
    closeSync(fd);
  }
}
