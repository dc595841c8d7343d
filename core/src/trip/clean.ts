import { emptyColumns, NUMERIC_COLUMNS, SIGNALS, type SampleColumns, TIME_MIN_MS } from '@thermargin/shared';

/** Thresholds of the cleaning pass; defaults defined once here. */
export const CLEANING_DEFAULTS = {
  /** K, 8: a coolant reading this far from both neighbours, which agree with each other, is a spike.
   *  A loop of 100 kJ/K under 300 kW moves 3 K/s at most, so 8 K in one step is not physics. */
  spike_coolant_k: 8,
  /** K, 5: the same for ambient air, which changes far more slowly. */
  spike_ambient_k: 5,
  /** s, 10: neighbours further apart than this say nothing about a spike. */
  spike_max_gap_s: 10,
} as const;

export interface Rejections {
  /** Samples rejected, by reason; sums to `total`. */
  by_reason: Record<string, number>;
  total: number;
  /** Every rejected sample that had a usable time, time-sorted after cleaning, so trips can count their own. */
  events: { time_ms: number; reason: string }[];
  /** Optional values dropped from otherwise good samples (the sample is kept), by reason. */
  dropped_values: Record<string, number>;
}

export function emptyRejections(): Rejections {
  return { by_reason: {}, total: 0, events: [], dropped_values: {} };
}

function count(map: Record<string, number>, reason: string): void {
  map[reason] = (map[reason] ?? 0) + 1;
}

function reject(r: Rejections, reason: string, time_ms: number): void {
  count(r.by_reason, reason);
  r.total++;
  if (Number.isFinite(time_ms)) r.events.push({ time_ms, reason });
}

const REQUIRED = ['speed_kmh', 'power_kw', 'coolant_in_c', 'ambient_c', 'fan_pct'] as const;
const OPTIONAL = ['coolant_out_c', 'coolant_flow_lpm'] as const;

/** Columns and limits hoisted out of the per-sample loop (dynamic property access is slow there). */
function checks(c: SampleColumns, names: readonly (keyof typeof SIGNALS)[]) {
  return names.map((name) => ({ name, x: c[name], min: SIGNALS[name].min, max: SIGNALS[name].max }));
}

/**
 * Marks samples that cannot be used at all (reason) and drops implausible optional values (NaN).
 * Returns the indices of usable samples.
 */
function usable(c: SampleColumns, r: Rejections): Int32Array {
  const t = c.time_ms;
  const req = checks(c, REQUIRED);
  const opt = checks(c, OPTIONAL);
  const kept = new Int32Array(c.n);
  let m = 0;
  for (let i = 0; i < c.n; i++) {
    const ti = t[i]!;
    let fault: string | null = null;
    if (!Number.isFinite(ti)) fault = 'time_invalid';
    else if (ti < TIME_MIN_MS) fault = 'time_before_2000';
    else {
      for (const k of req) {
        const v = k.x[i]!;
        if (v >= k.min && v <= k.max) continue;
        fault = Number.isNaN(v) ? `${k.name}_missing` : `${k.name}_out_of_range`;
        break;
      }
    }
    if (fault) {
      reject(r, fault, ti);
      continue;
    }
    for (const k of opt) {
      const v = k.x[i]!;
      if (Number.isNaN(v) || (v >= k.min && v <= k.max)) continue;
      k.x[i] = Number.NaN;
      count(r.dropped_values, `${k.name}_out_of_range`);
    }
    const d = c.derate[i]!;
    if (d !== 0 && d !== 1 && !Number.isNaN(d)) {
      c.derate[i] = Number.NaN;
      count(r.dropped_values, 'derate_out_of_range');
    }
    kept[m++] = i;
  }
  return kept.subarray(0, m);
}

function isSorted(t: Float64Array, idx: Int32Array): boolean {
  for (let k = 1; k < idx.length; k++) if (t[idx[k]!]! < t[idx[k - 1]!]!) return false;
  return true;
}

/** True when the value at position k of `idx` is a single-sample spike. */
function isSpike(
  x: Float64Array,
  t: Float64Array,
  idx: Int32Array,
  k: number,
  th: number,
  gap_ms: number,
): boolean {
  if (k === 0 || k === idx.length - 1) return false;
  const a = idx[k - 1]!;
  const b = idx[k]!;
  const d = idx[k + 1]!;
  const xa = x[a]!;
  const xb = x[b]!;
  const xd = x[d]!;
  // Cheap test first: almost every sample is close to its predecessor.
  if (!(Math.abs(xb - xa) > th)) return false;
  if (t[b]! - t[a]! > gap_ms || t[d]! - t[b]! > gap_ms || Number.isNaN(xd)) return false;
  const up = xb - xa > th && xb - xd > th;
  const down = xa - xb > th && xd - xb > th;
  return (up || down) && Math.abs(xd - xa) < th / 2;
}

/**
 * Orders one vehicle's samples by time, drops duplicates (same time: the first kept), rejects samples
 * with a missing or implausible required signal (SIGNALS ranges) and single-sample temperature spikes.
 * Never interpolates: gaps stay gaps. Every rejected sample is counted by reason.
 * Note: writes NaN into `input`'s optional columns where a value is implausible, and returns `input`
 * itself when nothing was dropped or reordered (no copy: allocation dominates on large inputs).
 */
export function cleanSamples(
  input: SampleColumns,
  opts: typeof CLEANING_DEFAULTS = CLEANING_DEFAULTS,
): { columns: SampleColumns; rejections: Rejections } {
  const r = emptyRejections();
  const t = input.time_ms;
  let idx = usable(input, r);
  if (!isSorted(t, idx)) idx = Int32Array.from(idx).sort((a, b) => t[a]! - t[b]! || a - b);

  let m = 0;
  for (let k = 0; k < idx.length; k++) {
    if (k > 0 && t[idx[k]!] === t[idx[m - 1]!]) reject(r, 'duplicate_time', t[idx[k]!]!);
    else idx[m++] = idx[k]!;
  }
  idx = idx.subarray(0, m);

  const gap_ms = opts.spike_max_gap_s * 1000;
  const cin = input.coolant_in_c;
  const amb = input.ambient_c;
  const cout = input.coolant_out_c;
  // Spike tests read the original neighbours, so survivors are compacted after all tests.
  const spiked = new Uint8Array(idx.length);
  let dropped = 0;
  for (let k = 0; k < idx.length; k++) {
    const reason = isSpike(cin, t, idx, k, opts.spike_coolant_k, gap_ms)
      ? 'spike_coolant_in_c'
      : isSpike(amb, t, idx, k, opts.spike_ambient_k, gap_ms)
        ? 'spike_ambient_c'
        : null;
    if (reason) {
      spiked[k] = 1;
      dropped++;
      reject(r, reason, t[idx[k]!]!);
    } else if (isSpike(cout, t, idx, k, opts.spike_coolant_k, gap_ms)) {
      count(r.dropped_values, 'spike_coolant_out_c');
      cout[idx[k]!] = Number.NaN;
    }
  }
  r.events.sort((x, y) => x.time_ms - y.time_ms);
  const final = new Int32Array(idx.length - dropped);
  for (let k = 0, j = 0; k < idx.length; k++) if (!spiked[k]) final[j++] = idx[k]!;
  if (final.length === input.n) return { columns: input, rejections: r };
  const out = emptyColumns(final.length);
  for (const name of NUMERIC_COLUMNS) {
    const src = input[name];
    const dst = out[name];
    for (let j = 0; j < final.length; j++) dst[j] = src[final[j]!]!;
  }
  for (let j = 0; j < final.length; j++) out.trip[j] = input.trip[final[j]!];
  return { columns: out, rejections: r };
}
