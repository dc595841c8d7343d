import type { Sample } from './telemetry.ts';

/**
 * One vehicle's samples in columnar form, the shape the core computes on and the stores read into:
 * typed arrays for speed, NaN for a missing optional signal, `trip` as given (undefined when absent).
 */
export interface SampleColumns {
  n: number;
  time_ms: Float64Array;
  speed_kmh: Float64Array;
  power_kw: Float64Array;
  coolant_in_c: Float64Array;
  coolant_out_c: Float64Array;
  ambient_c: Float64Array;
  fan_pct: Float64Array;
  coolant_flow_lpm: Float64Array;
  derate: Float64Array;
  trip: (string | undefined)[];
}

export const NUMERIC_COLUMNS = [
  'time_ms',
  'speed_kmh',
  'power_kw',
  'coolant_in_c',
  'coolant_out_c',
  'ambient_c',
  'fan_pct',
  'coolant_flow_lpm',
  'derate',
] as const;
export type NumericColumn = (typeof NUMERIC_COLUMNS)[number];

export function emptyColumns(n: number): SampleColumns {
  const c = { n, trip: new Array<string | undefined>(n) } as SampleColumns;
  for (const name of NUMERIC_COLUMNS) c[name] = new Float64Array(n);
  return c;
}

/** Rows [from, to) of `c` as a view sharing its memory (trip ids copied). */
export function sliceColumns(c: SampleColumns, from: number, to: number): SampleColumns {
  const out = { n: to - from, trip: c.trip.slice(from, to) } as SampleColumns;
  for (const name of NUMERIC_COLUMNS) out[name] = c[name].subarray(from, to);
  return out;
}

/** Copies rows [from, to) of `src` into `dst` at `at`. */
export function copyColumns(
  src: SampleColumns,
  from: number,
  to: number,
  dst: SampleColumns,
  at: number,
): void {
  for (const name of NUMERIC_COLUMNS) dst[name].set(src[name].subarray(from, to), at);
  for (let i = from; i < to; i++) dst.trip[at + i - from] = src.trip[i];
}

/** Columns from sample objects (one vehicle), in the order given. */
export function columnsFromSamples(samples: readonly Sample[]): SampleColumns {
  const c = emptyColumns(samples.length);
  samples.forEach((s, i) => {
    for (const name of NUMERIC_COLUMNS) c[name][i] = s[name] ?? Number.NaN;
    c.trip[i] = s.trip;
  });
  return c;
}

/** Sample objects from columns (NaN optional signals become undefined). */
export function samplesFromColumns(vehicle: string, c: SampleColumns): Sample[] {
  const out: Sample[] = [];
  for (let i = 0; i < c.n; i++) {
    const s: Sample = {
      time_ms: c.time_ms[i]!,
      vehicle,
      speed_kmh: c.speed_kmh[i]!,
      power_kw: c.power_kw[i]!,
      coolant_in_c: c.coolant_in_c[i]!,
      ambient_c: c.ambient_c[i]!,
      fan_pct: c.fan_pct[i]!,
    };
    if (c.trip[i] !== undefined) s.trip = c.trip[i];
    for (const name of ['coolant_out_c', 'coolant_flow_lpm', 'derate'] as const) {
      const v = c[name][i]!;
      if (!Number.isNaN(v)) s[name] = v;
    }
    out.push(s);
  }
  return out;
}
