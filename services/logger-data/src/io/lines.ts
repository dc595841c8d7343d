import { closeSync, openSync, readSync } from 'node:fs';
import { InputError } from '@thermargin/shared';

/** bytes read per system call: few large reads win on these machines (≈ 1 µs per call). */
const READ_BYTES = 4 << 20;
/** bytes: a line longer than this is not a log line; the file is refused there rather than buffered whole. */
export const MAX_LINE_BYTES = 1 << 20;

/** Receives each line as bytes s[start, end) without its line end (\n or \r\n), with its 1-based number. */
export type LineVisitor = (s: Buffer, start: number, end: number, line: number) => void;

/**
 * Reads a file line by line from large chunks, handing out byte ranges (no string per line). Memory
 * stays at one chunk whatever the file's size. Throws InputError when the file cannot be opened or a
 * line exceeds MAX_LINE_BYTES (naming the line).
 */
export function forEachLine(file: string, visit: LineVisitor, onBytes?: (n: number) => void): number {
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch {
    throw new InputError([{ where: file, rule: 'cannot open the file' }]);
  }
  const buf = Buffer.allocUnsafe(READ_BYTES);
  let kept = 0;
  let line = 0;
  const tooLong = () =>
    new InputError([{ where: `${file}:${line + 1}`, rule: `line longer than ${MAX_LINE_BYTES} bytes` }]);
  const take = (s: Buffer, start: number, nl: number) => {
    if (nl - start > MAX_LINE_BYTES) throw tooLong();
    visit(s, start, nl > start && s[nl - 1] === 13 ? nl - 1 : nl, ++line);
  };
  try {
    for (;;) {
      const n = readSync(fd, buf, kept, buf.length - kept, null);
      if (n === 0) break;
      const s = buf.subarray(0, kept + n);
      let start = 0;
      for (let nl = s.indexOf(10); nl >= 0; nl = s.indexOf(10, start)) {
        take(s, start, nl);
        start = nl + 1;
      }
      kept = s.length - start;
      if (kept > MAX_LINE_BYTES)
        throw new InputError([
          { where: `${file}:${line + 1}`, rule: `line longer than ${MAX_LINE_BYTES} bytes` },
        ]);
      buf.copyWithin(0, start, s.length);
      onBytes?.(n);
    }
  } finally {
    closeSync(fd);
  }
  if (kept > 0) take(buf, 0, kept);
  return line;
}
