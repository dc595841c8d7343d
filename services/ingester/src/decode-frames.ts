import {
  FUTURE_TOLERANCE_MS,
  NUMERIC_COLUMNS,
  readFrameBatch,
  type RejectReason,
  SIGNAL_NAMES,
  SIGNALS,
  type Sample,
  TIME_MIN_MS,
} from '@thermargin/shared';
import type { DeadLetter, FrameTally } from '@thermargin/store';
import { FrameDecoder } from '@thermargin/logger-data/j1939/decoder';
import type { VehicleReading } from './vehicle-readings.ts';

/** What a frames message gave: samples to store, its one letter for what could not be used, its tally. */
export interface FramesDecoded {
  samples: Sample[];
  rejects: DeadLetter[];
  /** Refused frames and samples by reason (a payload that breaks off counts 1). */
  refused: Partial<Record<RejectReason, number>>;
  tallies: FrameTally[];
}

/** Builds a dead letter of this message for a reason, with the rule in words and an excerpt. */
export type LetterOf = (reason: RejectReason, detail: string, excerpt: string) => DeadLetter;

const COLUMN = new Map<string, number>(NUMERIC_COLUMNS.map((c, i) => [c, i]));
const SIGNAL_COLUMNS = SIGNAL_NAMES.map((n) => ({ name: n, k: COLUMN.get(n)!, spec: SIGNALS[n] }));

/**
 * A message's refusals, told as one letter (as a samples message is): the most frequent reason, and
 * per reason how many with the first in words. Only the first of each reason is put in words.
 */
class Refusals {
  private readonly byReason = new Map<
    RejectReason,
    { n: number; detail: string; excerpt: string; what: string | undefined }
  >();
  /** `what` names the things counted ("frames"); without it the detail already says how many. */
  add(reason: RejectReason, n: number, detail: () => string, excerpt: () => string, what?: string): void {
    const c = this.byReason.get(reason);
    if (c) c.n += n;
    else this.byReason.set(reason, { n, detail: detail(), excerpt: excerpt(), what });
  }
  counts(): Partial<Record<RejectReason, number>> {
    return Object.fromEntries([...this.byReason].map(([r, c]) => [r, c.n]));
  }
  letters(letter: LetterOf): DeadLetter[] {
    const all = [...this.byReason];
    if (all.length === 0) return [];
    const told = all.map(([reason, c]) => {
      const text = c.what && c.n > 1 ? `${c.n} ${c.what}; the first: ${c.detail}` : c.detail;
      return all.length === 1 ? text : `${reason}: ${text}`;
    });
    const [reason, main] = all.reduce((a, b) => (b[1].n > a[1].n ? b : a));
    const excerpt = main.excerpt || all.find(([, c]) => c.excerpt)?.[1].excerpt || '';
    return [letter(reason, told.join('; '), excerpt)];
  }
}

const hex = (bytes: Uint8Array, from: number, n: number) =>
  Buffer.from(bytes.subarray(from, from + n)).toString('hex');

/**
 * A frames message (frame-batch.ts layout) → samples: the frames are decoded with the vehicle's reading
 * and resampled on their own, message by message, so a redelivered or duplicated batch gives the same
 * samples (stored once, by vehicle and time) and the same tally (kept once, by vehicle and batch start).
 * A payload that breaks off keeps the frames before the break; frames whose clock went back, whose data
 * length does not fit their PGN, and samples outside the plausible ranges or the accepted times are
 * dead-lettered in one letter per message, naming each reason with its count. Samples missing a required signal
 * (not sent, not available, stale) are counted in the tally as incomplete; unknown PGNs only counted.
 */
export function decodeFrames(
  vehicle: string,
  payload: Buffer,
  reading: VehicleReading,
  now_ms: number,
  letter: LetterOf,
): FramesDecoded {
  const samples: Sample[] = [];
  const refused = new Refusals();
  let incomplete = 0;
  const take = (v: Float64Array) => {
    const time_ms = v[0]!;
    const s: Record<string, unknown> = { time_ms, vehicle };
    for (const { name, k, spec } of SIGNAL_COLUMNS) {
      const x = v[k]!;
      if (Number.isNaN(x)) {
        if (spec.required) {
          incomplete++;
          return;
        }
        continue;
      }
      if (!(x >= spec.min && x <= spec.max) || (name === 'derate' && x !== 0 && x !== 1)) {
        refused.add(
          'range',
          1,
          () => `${name} ${x} at ${new Date(time_ms).toISOString()} outside ${spec.min}…${spec.max}`,
          () => JSON.stringify(s),
          'samples',
        );
        return;
      }
      s[name] = x;
    }
    if (time_ms < TIME_MIN_MS)
      refused.add(
        'time_past',
        1,
        () => `sample at ${time_ms} ms is before 2000-01-01`,
        () => JSON.stringify(s),
        'samples',
      );
    else if (time_ms > now_ms + FUTURE_TOLERANCE_MS)
      refused.add(
        'time_future',
        1,
        () => `sample at ${new Date(time_ms).toISOString()} is more than a day after the receive time`,
        () => JSON.stringify(s),
        'samples',
      );
    else samples.push(s as unknown as Sample);
  };
  // The frame being decoded, for the excerpt of a fault (kept in variables: no object per frame).
  let lastId = 0;
  let lastAt = 0;
  let lastLen = 0;
  const decoder = new FrameDecoder(reading.frames, take, (reason, detail) =>
    refused.add(
      reason,
      1,
      () => detail,
      () => `${(lastId & 0x1fff_ffff).toString(16).toUpperCase()}#${hex(payload, lastAt, lastLen)}`,
      'frames',
    ),
  );
  const report = readFrameBatch(payload, (t, id, len, bytes, at) => {
    lastId = id;
    lastAt = at;
    lastLen = len;
    decoder.frame(t, id, len, bytes, at);
  });
  decoder.finish();

  if (report.clock_back)
    refused.add(
      'clock_back',
      report.clock_back,
      () =>
        `${report.clock_back} frames earlier than the frame before them (the first is frame ${report.first_clock_back}); skipped`,
      () => '',
    );
  if (report.malformed !== null)
    refused.add(
      'frame_layout',
      1,
      () =>
        `${report.malformed}: frames ${report.unread_from}…${Math.max(report.unread_from, report.declared - 1)} of ${report.declared} unread` +
        (report.read ? `; the ${report.read} before were kept` : ''),
      () => hex(payload, 0, 1024),
    );
  const c = decoder.counts;
  const tallies: FrameTally[] = Number.isNaN(report.base_us)
    ? []
    : [
        {
          vehicle,
          start_ms: report.base_us / 1000,
          frames: c.frames,
          decoded: c.decoded,
          unknown_pgn: c.unknown_pgn,
          not_available: c.not_available,
          error_values: c.error_values,
          samples: samples.length,
          incomplete,
        },
      ];
  return { samples, rejects: refused.letters(letter), refused: refused.counts(), tallies };
}
