import { NUMERIC_COLUMNS, type SampleColumns } from '@thermargin/shared';

/** Rows [from, to) of `c` as a view sharing its memory (trip ids copied). */
export function sliceColumns(c: SampleColumns, from: number, to: number): SampleColumns {
  const out = { n: to - from, trip: c.trip.slice(from, to) } as SampleColumns;
  for (const name of NUMERIC_COLUMNS) out[name] = c[name].subarray(from, to);
  return out;
}
