import {
  copyColumns,
  NUMERIC_COLUMNS,
  type SampleColumns,
  emptyColumns,
  sliceColumns,
} from '@thermargin/shared';
import { lowerBound } from '@thermargin/shared/array-index';

/**
 * Sealed history of the SQLite adapter: one vehicle's consecutive samples packed column by column
 * into one BLOB of Float64 (NaN = missing), so a read is a few memory copies instead of a row-to-column
 * conversion per sample. Native byte order (little-endian on every supported platform).
 */
export const BLOCK_DEFAULTS = {
  /** samples per block: 4096 × 9 columns × 8 bytes = 288 KiB. */
  samples: 4096,
  /** samples of one vehicle in one write call from which they are packed at once, with the rows
   *  since its previous block (smaller writes become rows, packed once there are `samples` of them). */
  min_pack: 256,
  /** samples moved from rows into blocks in one write call at most (bounds its latency). */
  max_compact_samples: 16 * 4096,
  /** ms: a hole at least this long, and `gap_ratio` times the block's cadence, ends a block, so a
   *  message that arrives after its successors (shared subscriptions reorder a burst) fills the hole
   *  as a block of its own instead of rewriting the block around it. */
  gap_ms: 5000,
  gap_ratio: 4,
};

/**
 * True where a block should end before an interval of `dt_ms` (see gap_ms). `cadence_ms`: the
 * shortest interval in the block so far (null for a block of one sample, which any hole ends).
 */
export function isHole(dt_ms: number, cadence_ms: number | null, o: typeof BLOCK_DEFAULTS): boolean {
  return dt_ms >= o.gap_ms && (cadence_ms === null || dt_ms >= o.gap_ratio * cadence_ms);
}

const WIDTH = NUMERIC_COLUMNS.length;

/** A block as stored: its time range, count, the packed columns and the trip labels as runs. */
export interface EncodedBlock {
  first_ms: number;
  last_ms: number;
  n: number;
  columns: Buffer;
  /** JSON `[[index where a run starts, trip or null], …]`. */
  trips: string;
}

export function encodeBlock(c: SampleColumns, from: number, to: number): EncodedBlock {
  const n = to - from;
  const packed = new Float64Array(WIDTH * n);
  NUMERIC_COLUMNS.forEach((name, j) => {
    packed.set(c[name].subarray(from, to), j * n);
  });
  const runs: [number, string | null][] = [];
  for (let i = from; i < to; i++) {
    const trip = c.trip[i] ?? null;
    if (i === from || trip !== (c.trip[i - 1] ?? null)) runs.push([i - from, trip]);
  }
  return {
    first_ms: c.time_ms[from]!,
    last_ms: c.time_ms[to - 1]!,
    n,
    columns: Buffer.from(packed.buffer, packed.byteOffset, packed.byteLength),
    trips: JSON.stringify(runs),
  };
}

/** A stored block as columns viewing the blob (copied once only when it is not 8-byte aligned). */
export function decodeBlock(n: number, columns: Uint8Array, trips: string): SampleColumns {
  if (columns.byteLength !== WIDTH * n * 8)
    throw new Error(
      `sample block: ${columns.byteLength} bytes for ${n} samples of ${WIDTH} columns (written with another signal list?)`,
    );
  const bytes = columns.byteOffset % 8 === 0 ? columns : new Uint8Array(columns);
  const packed = new Float64Array(bytes.buffer, bytes.byteOffset, WIDTH * n);
  const c = { n, trip: new Array<string | undefined>(n) } as SampleColumns;
  NUMERIC_COLUMNS.forEach((name, j) => {
    c[name] = packed.subarray(j * n, (j + 1) * n);
  });
  const runs = JSON.parse(trips) as [number, string | null][];
  runs.forEach(([start, trip], k) => {
    c.trip.fill(trip ?? undefined, start, runs[k + 1]?.[0] ?? n);
  });
  return c;
}

/** Two time-sorted column sets as one; where both hold a time, `b`'s sample wins (the newer write). */
export function mergeRows(a: SampleColumns, b: SampleColumns): SampleColumns {
  const out = emptyColumns(a.n + b.n);
  let i = 0;
  let j = 0;
  let n = 0;
  while (i < a.n || j < b.n) {
    const k = lowerBound(a.time_ms, j < b.n ? b.time_ms[j]! : Number.POSITIVE_INFINITY, i);
    copyColumns(a, i, k, out, n);
    n += k - i;
    i = k;
    if (j === b.n) break;
    const ta = i < a.n ? a.time_ms[i]! : Number.POSITIVE_INFINITY;
    let l = lowerBound(b.time_ms, ta, j);
    if (l < b.n && b.time_ms[l] === ta) {
      l++;
      i++; // replaced by b's sample of the same time
    }
    copyColumns(b, j, l, out, n);
    n += l - j;
    j = l;
  }
  return sliceColumns(out, 0, n);
}
