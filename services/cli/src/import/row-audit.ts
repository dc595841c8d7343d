import { NUMERIC_COLUMNS, SIGNALS, type SignalName } from '@thermargin/shared';
import { rangeHint } from '@thermargin/logger-data/table/unit-hint';

/** Rows shown with file:line on stderr; the rest are only counted. */
export const BAD_ROWS_SHOWN = 10;

/** The required signals' columns and plausible ranges, looked up once rather than on every row. */
const REQUIRED = NUMERIC_COLUMNS.flatMap((c, k) => {
  const spec = SIGNALS[c as SignalName];
  return k > 0 && spec?.required ? [{ name: c as SignalName, k, min: spec.min, max: spec.max }] : [];
});

/** Refused values of one kind: how many, and their span. */
export interface Span {
  n: number;
  min: number;
  max: number;
}
/** Per vehicle, per reason. */
export type VehicleSpans = Map<string, Map<string, Span>>;

/** What one file gave to say, in order: its first bad rows, how many there were, and notes after it. */
export interface FileNotes {
  lines: string[];
  bad: number;
  notes: string[];
}

/**
 * Says which rows will be refused and why, where the reader still knows their file and line: the first
 * BAD_ROWS_SHOWN of each file as `file:line: rule`, and per file and per vehicle what refused values look
 * like. It only reports: cleaning refuses the rows (the same SIGNALS ranges) and counts them by the same
 * reasons. One record per file, so files read on several threads are told in file order (NoteMerger).
 */
export class RowAudit {
  readonly vehicleSpans: VehicleSpans = new Map();
  private file: FileNotes = { lines: [], bad: 0, notes: [] };
  private readonly fileSpans = new Map<string, Span>();
  private fileRows = 0;

  /** A row the reader itself refused (syntax, bad number, bad time). */
  bad(where: string, reason: string): void {
    if (this.file.bad++ < BAD_ROWS_SHOWN) this.file.lines.push(`${where}: row skipped: ${reason}`);
  }

  /**
   * A row read (line `at` of a table, or a sample built from frames at epoch ms `at`): notes a required
   * signal missing or outside its plausible range.
   */
  row(file: string, at: number, vehicle: string, values: Float64Array, from_frames = false): void {
    this.fileRows++;
    for (const { name, k, min, max } of REQUIRED) {
      const v = values[k]!;
      if (v >= min && v <= max) continue;
      const reason = Number.isNaN(v) ? `${name}_missing` : `${name}_out_of_range`;
      if (this.file.bad++ < BAD_ROWS_SHOWN) {
        const where = from_frames ? `${file}: sample at ${new Date(at).toISOString()}` : `${file}:${at}`;
        this.file.lines.push(
          `${where}: row refused: ${reason}${Number.isNaN(v) ? '' : ` (${v} outside ${min}…${max})`}`,
        );
      }
      note(this.fileSpans, reason, v);
      let spans = this.vehicleSpans.get(vehicle);
      if (!spans) this.vehicleSpans.set(vehicle, (spans = new Map()));
      note(spans, reason, v);
      return;
    }
  }

  /** A line to tell after the file's bad rows (e.g. what its frames held). */
  note(line: string): void {
    this.file.notes.push(line);
  }

  /** At the end of a file: when most of its rows fail one rule, what their values look like; its record. */
  endFile(file: string): FileNotes {
    for (const [reason, s] of this.fileSpans)
      if (s.n > this.fileRows / 2)
        this.file.notes.push(`${file}: ${s.n} of ${this.fileRows} rows refused: ${hint(reason, s)}`);
    const done = this.file;
    this.file = { lines: [], bad: 0, notes: [] };
    this.fileSpans.clear();
    this.fileRows = 0;
    return done;
  }
}

/** Tells the files' records in file order, the first BAD_ROWS_SHOWN bad rows of all of them and the count of the rest. */
export class NoteMerger {
  private shown = 0;
  constructor(private readonly log: (line: string) => void) {}

  add(r: FileNotes): void {
    for (const line of r.lines) if (this.shown++ < BAD_ROWS_SHOWN) this.log(line);
    this.shown += r.bad - r.lines.length;
    for (const line of r.notes) this.log(line);
  }

  end(): void {
    if (this.shown > BAD_ROWS_SHOWN)
      this.log(`… ${this.shown - BAD_ROWS_SHOWN} more bad rows skipped (counted in rejected.by_reason)`);
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

/** Adds `from` into `into` (spans of files read on another thread). */
export function mergeSpans(into: VehicleSpans, from: VehicleSpans): void {
  for (const [vehicle, spans] of from) {
    let mine = into.get(vehicle);
    if (!mine) into.set(vehicle, (mine = new Map()));
    for (const [reason, s] of spans) {
      const m = mine.get(reason);
      if (!m) mine.set(reason, { ...s });
      else {
        m.n += s.n;
        m.min = Math.min(m.min, s.min);
        m.max = Math.max(m.max, s.max);
      }
    }
  }
}

/** Why a vehicle's rows were refused, worst first, for a vehicle left without trips. */
export function vehicleReasons(spans: VehicleSpans, vehicle: string): string[] {
  return [...(spans.get(vehicle) ?? [])]
    .sort((a, b) => b[1].n - a[1].n)
    .map(
      ([reason, s]) => `${s.n} ${reason}${reason.endsWith('_out_of_range') ? ` (${hint(reason, s)})` : ''}`,
    );
}

function hint(reason: string, s: Span): string {
  if (!reason.endsWith('_out_of_range')) return reason.replace(/_missing$/, ' missing (no value)');
  return rangeHint(reason.slice(0, -'_out_of_range'.length) as SignalName, s.min, s.max);
}
