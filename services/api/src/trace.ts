import { TRACE_COLUMNS, type SampleColumns, type TraceColumn } from '@thermargin/shared';
import { lttbIndices } from '@thermargin/core/stats/lttb';
import type { TripSampleView } from '@thermargin/core/trip/sample-view';

/** Signals LTTB picks points by: their shapes are the ones kept. */
const SHAPE = ['speed_kmh', 'power_kw', 'coolant_in_c', 'ambient_c', 'fan_pct'] as const;

function column(c: SampleColumns, v: TripSampleView, name: TraceColumn): ArrayLike<number> {
  switch (name) {
    case 'heat_generated_kw':
    case 'heat_rejected_kw':
    case 'k_w_m2k':
      return v[name];
    case 'counted_ram':
      return Array.from(v.counted, (b) => (b === 1 ? 1 : 0));
    case 'counted_fan':
      return Array.from(v.counted, (b) => (b === 2 ? 1 : 0));
    default:
      return c[name];
  }
}

/**
 * A trip's samples as chart columns `[time_ms, ...series]`, downsampled to about `points` with LTTB.
 * A step longer than `gap_ms` (the estimator never bridges one) becomes a row of nulls, so the chart
 * breaks the line instead of drawing across; budget is shared over the pieces by sample count.
 */
export function traceColumns(
  c: SampleColumns,
  v: TripSampleView,
  points: number,
  gap_ms: number,
): (number | null)[][] {
  const cols = TRACE_COLUMNS.map((name) => column(c, v, name));
  const shape: Float64Array[] = [...SHAPE.map((name) => c[name]), v.heat_generated_kw];
  const out: (number | null)[][] = TRACE_COLUMNS.map(() => []);
  const t = c.time_ms;
  let from = 0;
  for (let i = 1; i <= c.n; i++) {
    if (i < c.n && t[i]! - t[i - 1]! <= gap_ms) continue;
    if (from > 0) {
      out[0]!.push((t[from - 1]! + t[from]!) / 2);
      for (let j = 1; j < out.length; j++) out[j]!.push(null);
    }
    const budget = Math.max(3, Math.round((points * (i - from)) / c.n));
    const pick = lttbIndices(
      t.subarray(from, i),
      shape.map((s) => s.subarray(from, i)),
      budget,
    );
    for (const k of pick) {
      for (let j = 0; j < cols.length; j++) {
        const x = cols[j]![from + k]!;
        out[j]!.push(Number.isNaN(x) ? null : x);
      }
    }
    from = i;
  }
  return out;
}
