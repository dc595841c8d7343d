import { closeSync, openSync, readSync } from 'node:fs';
import { InputError } from '@thermargin/shared';
import { LINE_BAD, LINE_FRAME, LINE_NO_DATA, newParsedFrame, parseCandumpLine } from '../candump.ts';
import { lineTooLong, MAX_LINE_BYTES, READ_BYTES, roomFor } from './lines.ts';

/** What a candump log held besides frames, counted. */
export interface CandumpFileCounts {
  lines: number;
  frames: number;
  /** Lines that are no `candump -l` frame (syntax, not hex, too many bytes). */
  bad_lines: number;
  /** Remote, CAN FD and error frames: valid, but without parameters to read. */
  no_data: number;
  /** Frames earlier than the one before them (a clock stepped back): skipped, the decoder needs order. */
  clock_back: number;
}

/** Receives each frame of a log: time (epoch µs), identifier, data in bytes[at, at + length), its line. */
export type CandumpVisitor = (
  time_us: number,
  id: number,
  length: number,
  bytes: Uint8Array,
  at: number,
  line: number,
) => void;

/**
 * Reads a `candump -l` log, handing each frame in time order to `visit`; each line that cannot be used
 * goes to `bad` with its file:line and the rule (`candump_syntax`, `clock_back`), then is counted. Reads
 * large chunks and parses lines in place, the parser finding each line's end (memory: one chunk).
 * Throws InputError when the file cannot be opened or a line exceeds `max_line_bytes`.
 */
export function readCandumpFile(
  file: string,
  visit: CandumpVisitor,
  bad: (where: string, reason: string, detail: string) => void,
  onBytes?: (n: number) => void,
  max_line_bytes = MAX_LINE_BYTES,
): CandumpFileCounts {
  const f = newParsedFrame();
  const c: CandumpFileCounts = { lines: 0, frames: 0, bad_lines: 0, no_data: 0, clock_back: 0 };
  let latest = Number.NEGATIVE_INFINITY;
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch {
    throw new InputError([{ where: file, rule: 'cannot open the file' }]);
  }
  const tooLong = () => lineTooLong(file, c.lines + 1, max_line_bytes);
  let buf = Buffer.allocUnsafe(READ_BYTES);
  let kept = 0;
  try {
    for (;;) {
      buf = roomFor(buf, kept);
      const n = readSync(fd, buf, kept, buf.length - kept, null);
      const eof = n === 0;
      const limit = kept + n;
      let p = 0;
      while (p < limit) {
        const kind = parseCandumpLine(buf, p, limit, f);
        if (!f.terminated && !eof) break; // the rest of this line comes with the next read
        if (f.next - p > max_line_bytes) throw tooLong();
        p = f.next;
        const line = ++c.lines;
        if (kind === LINE_FRAME) {
          if (f.time_us < latest) {
            c.clock_back++;
            bad(
              `${file}:${line}`,
              'clock_back',
              `time ${(f.time_us / 1e6).toFixed(6)} is before the frame before it`,
            );
            continue;
          }
          latest = f.time_us;
          c.frames++;
          visit(f.time_us, f.id, f.length, f.data, 0, line);
        } else if (kind === LINE_BAD) {
          c.bad_lines++;
          bad(`${file}:${line}`, 'candump_syntax', f.why);
        } else if (kind === LINE_NO_DATA) c.no_data++;
      }
      if (eof) break;
      kept = limit - p;
      if (kept > max_line_bytes) throw tooLong();
      buf.copyWithin(0, p, limit);
      onBytes?.(n);
    }
  } finally {
    closeSync(fd);
  }
  return c;
}
