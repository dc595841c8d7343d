import { copyColumns, emptyColumns, NUMERIC_COLUMNS, type SampleColumns, sliceColumns } from './columns.ts';

/** Appends samples into growable typed columns (doubling), then hands out SampleColumns views. */
export class ColumnBuilder {
  private cols: SampleColumns;
  /** The numeric columns in NUMERIC_COLUMNS order, hoisted for the per-sample loop. */
  private arrays: Float64Array[];
  length = 0;

  constructor(capacity = 4096) {
    this.cols = emptyColumns(capacity);
    this.arrays = NUMERIC_COLUMNS.map((name) => this.cols[name]);
  }

  private grow(): void {
    const next = emptyColumns(this.cols.n * 2);
    copyColumns(this.cols, 0, this.cols.n, next, 0);
    this.cols = next;
    this.arrays = NUMERIC_COLUMNS.map((name) => next[name]);
  }

  /** Appends one sample; `values` is indexed by NUMERIC_COLUMNS order (NaN for missing). */
  push(values: ArrayLike<number>, trip: string | undefined): void {
    if (this.length === this.cols.n) this.grow();
    const i = this.length++;
    const a = this.arrays;
    for (let k = 0; k < a.length; k++) a[k]![i] = values[k]!;
    this.cols.trip[i] = trip;
  }

  /** The samples [from, to) as columns that share this builder's memory: valid until the next push or drop. */
  view(from = 0, to = this.length): SampleColumns {
    return sliceColumns(this.cols, from, to);
  }

  /** Drops the samples before `from`, moving the rest to the front (no new memory). */
  dropBefore(from: number): void {
    for (const a of this.arrays) a.copyWithin(0, from, this.length);
    this.cols.trip.copyWithin(0, from, this.length);
    this.length -= from;
  }

  /** Read access to the live columns (valid up to `length`). */
  get live(): Readonly<SampleColumns> {
    return this.cols;
  }
}
