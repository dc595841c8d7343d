import { NUMERIC_COLUMNS, SIGNALS, type SignalName } from '@thermargin/shared';
import { rangeHint } from '@thermargin/logger-data/table/unit-hint';

/** Rows shown with file:line on stderr; the rest are only counted. */
export const BAD_ROWS_SHOWN = 10;

const REQUIRED = NUMERIC_COLUMNS.map((c, k) => ({ name: c as SignalName, k })).filter(
  (c) => c.k > 0 && SIGNALS[c.name]?.required,
);

/** Out-of-range values of one signal: how many, and their span. */
interface Span {
  n: number;
  min: number;
  max: number;
}

/**
 * Says which rows will be refused and why, where the reader still knows their file and line: the first
 * BAD_ROWS_SHOWN as `file:line: rule`, and per file and per vehicle what the refused values look like.
 * It only reports: cleaning refuses the rows (the same SIGNALS ranges) and counts them by the same reasons.
 */
export class RowAudit {
  private shown = 0;
  private readonly fileSpans = new Map<string, Span>();
  private readonly vehicleSpans = new Map<string, Map<string, Span>>();
  private fileRows = 0;

  constructor(private readonly log: (line: string) => void) {}

  /** A row the reader itself refused (syntax, bad number, bad time). */
  bad(where: string, reason: string): void {
    if (this.shown++ < BAD_ROWS_SHOWN) this.log(`${where}: row skipped: ${reason}`);
  }

  /**
   * A row read (line `at` of a table, or a sample built from frames at epoch ms `at`): notes a required
   * signal missing or outside its plausible range.
   */
  row(file: string, at: number, vehicle: string, values: Float64Array, from_frames = false): void {
    this.fileRows++;
    for (const { name, k } of REQUIRED) {
      const v = values[k]!;
      const spec = SIGNALS[name];
      if (v >= spec.min && v <= spec.max) continue;
      const reason = Number.isNaN(v) ? `${name}_missing` : `${name}_out_of_range`;
      if (this.shown++ < BAD_ROWS_SHOWN)
        this.log(
          `${from_frames ? `${file}: sample at ${new Date(at).toISOString()}` : `${file}:${at}`}: row refused: ${reason}${Number.isNaN(v) ? '' : ` (${v} outside ${spec.min}…${spec.max})`}`,
        );
      note(this.fileSpans, reason, v);
      let spans = this.vehicleSpans.get(vehicle);
      if (!spans) this.vehicleSpans.set(vehicle, (spans = new Map()));
      note(spans, reason, v);
      return;
    }
  }

  /** At the end of a file: when most of its rows fail one rule, what their values look like. */
  endFile(file: string): void {
    for (const [reason, s] of this.fileSpans)
      if (s.n > this.fileRows / 2)
        this.log(`${file}: ${s.n} of ${this.fileRows} rows refused: ${hint(reason, s)}`);
    this.fileSpans.clear();
    this.fileRows = 0;
  }

  /** After the last file: how many rows were shown and how many more were only counted. */
  end(): void {
    if (this.shown > BAD_ROWS_SHOWN)
      this.log(`… ${this.shown - BAD_ROWS_SHOWN} more bad rows skipped (counted in rejected.by_reason)`);
  }

  /** Why a vehicle's rows were refused, worst first, for a vehicle left without trips. */
  vehicleReasons(vehicle: string): string[] {
    const spans = [...(this.vehicleSpans.get(vehicle) ?? [])].sort((a, b) => b[1].n - a[1].n);
    return spans.map(
      ([reason, s]) => `${s.n} ${reason}${reason.endsWith('_out_of_range') ? ` (${hint(reason, s)})` : ''}`,
    );
  }
}

function note(spans: Map<string, Span>, reason: string, v: number): void {
  const s = spans.get(reason);
  if (!s) spans.set(reason, { n: 1, min: v, max: v });
  else {
    s.n++;
    if (v < s.min) s.min = v;
    if (v > s.max) s.max = v;
  }
}

function hint(reason: string, s: Span): string {
  if (!reason.endsWith('_out_of_range')) return reason.replace(/_missing$/, ' missing (no value)');
  return rangeHint(reason.slice(0, -'_out_of_range'.length) as SignalName, s.min, s.max);
}
