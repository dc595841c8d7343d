import { closeSync, openSync, readSync } from 'node:fs';
import { InputError, isValidId, NUMERIC_COLUMNS, SIGNALS } from '@thermargin/shared';
import { readDecimal } from './decimal.ts';
import { fastTime_ms } from './iso-time.ts';

/** Receives what a CSV file holds: good rows as values in NUMERIC_COLUMNS order, bad rows with a reason. */
export interface CsvSink {
  sample(vehicle: string, values: Float64Array, trip: string | undefined): void;
  bad(where: string, reason: string): void;
}

const REQUIRED_COLUMNS = [
  'time',
  'vehicle',
  ...Object.entries(SIGNALS)
    .filter(([, s]) => s.required)
    .map(([k]) => k),
];

interface Layout {
  vehicle: number;
  trip: number;
  /** Column index per NUMERIC_COLUMNS entry (time first), −1 when absent. */
  numeric: number[];
  width: number;
}

function layoutOf(file: string, header: string): Layout {
  const names = splitCsvLine(header).map((h) => h.trim().replace(/^(\uFEFF|\u00EF\u00BB\u00BF)/, ''));
  const missing = REQUIRED_COLUMNS.filter((c) => !names.includes(c));
  if (missing.length)
    throw new InputError(
      [
        {
          where: `${file}:1`,
          rule: `missing column(s) ${missing.join(', ')}; header has: ${names.join(', ') || '(nothing)'}`,
        },
      ],
      `${file} has no usable header row`,
    );
  return {
    vehicle: names.indexOf('vehicle'),
    trip: names.indexOf('trip'),
    numeric: NUMERIC_COLUMNS.map((c) => names.indexOf(c === 'time_ms' ? 'time' : c)),
    width: names.length,
  };
}

/** Splits one CSV line with double-quoted fields (RFC 4180 quoting). */
export function splitCsvLine(line: string): string[] {
  if (!line.includes('"')) return line.split(',');
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cur += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out;
}

/** Field boundaries of the line text[start, end) into `from`/`to` (at most their length); returns the count. */
function fieldBounds(text: string, start: number, end: number, from: Int32Array, to: Int32Array): number {
  let f = 0;
  let pos = start;
  while (f < from.length) {
    let comma = text.indexOf(',', pos);
    if (comma < 0 || comma > end) comma = end;
    from[f] = pos;
    to[f++] = comma;
    if (comma === end) break;
    pos = comma + 1;
  }
  return f;
}

/** A field as text, reusing the previous string when the characters are the same (ids repeat row after row). */
function fieldText(text: string, a: number, b: number, previous: string): string {
  return b - a === previous.length && text.startsWith(previous, a) ? previous : text.slice(a, b).trim();
}

/** Parses the rows of one file; positions of fields are kept in reusable arrays. */
class RowParser {
  private layout: Layout | null = null;
  private from = new Int32Array(0);
  private to = new Int32Array(0);
  private values = new Float64Array(NUMERIC_COLUMNS.length);
  /** The last valid vehicle id seen (repeats are not validated again). */
  private vehicle = '';
  private trip = '';
  line = 0;
  rows = 0;

  constructor(
    private readonly file: string,
    private readonly sink: CsvSink,
  ) {}

  /** One line: text[start, end); `quoted` when it holds a double quote. */
  take(text: string, start: number, end: number, quoted: boolean): void {
    this.line++;
    if (this.line === 1) {
      this.layout = layoutOf(this.file, text.slice(start, end));
      this.from = new Int32Array(this.layout.width);
      this.to = new Int32Array(this.layout.width);
      return;
    }
    if (end === start || (text.charCodeAt(start) <= 32 && text.slice(start, end).trim() === '')) return;
    if (quoted) {
      // Rare: rebuild the line unquoted, then read it like any other.
      const fields = splitCsvLine(text.slice(start, end));
      if (fields.some((f) => f.includes(','))) {
        this.sink.bad(`${this.file}:${this.line}`, 'csv_comma_in_field');
        return;
      }
      const flat = fields.join(',');
      this.row(flat, fieldBounds(flat, 0, flat.length, this.from, this.to));
      return;
    }
    this.row(text, fieldBounds(text, start, end, this.from, this.to));
  }

  private row(text: string, fields: number): void {
    const l = this.layout!;
    const { from, to, values } = this;
    if (fields < l.width) {
      this.bad('csv_short_row');
      return;
    }
    const vehicle = fieldText(text, from[l.vehicle]!, to[l.vehicle]!, this.vehicle);
    if (vehicle !== this.vehicle && !isValidId(vehicle)) {
      this.bad('csv_bad_vehicle');
      return;
    }
    this.vehicle = vehicle;
    const tc = l.numeric[0]!;
    const time = fastTime_ms(text.slice(from[tc]!, to[tc]!).trim());
    if (!Number.isFinite(time)) {
      this.bad('csv_bad_time');
      return;
    }
    values[0] = time;
    for (let k = 1; k < l.numeric.length; k++) {
      const col = l.numeric[k]!;
      const x = col < 0 ? undefined : readDecimal(text, from[col]!, to[col]!);
      if (x === undefined) values[k] = Number.NaN;
      else if (Number.isNaN(x)) {
        this.bad(`csv_not_a_number:${NUMERIC_COLUMNS[k]}`);
        return;
      } else values[k] = x;
    }
    let trip: string | undefined;
    if (l.trip >= 0) {
      this.trip = fieldText(text, from[l.trip]!, to[l.trip]!, this.trip);
      trip = this.trip || undefined;
      if (trip !== undefined && !isValidId(trip)) {
        this.bad('csv_bad_trip');
        return;
      }
    }
    this.rows++;
    this.sink.sample(this.vehicle, values, trip);
  }

  private bad(reason: string): void {
    this.sink.bad(`${this.file}:${this.line}`, reason);
  }
}

/** bytes read per system call: few large reads win on these machines (≈ 1 µs per call). */
const READ_BYTES = 4 << 20;

/**
 * Reads one CSV file of the import format (header naming the contract's columns in any order,
 * unknown columns ignored, empty cell = missing) into `sink`, chunk by chunk. Decoded as Latin-1: every
 * valid field is ASCII, and a stray byte makes an invalid id or number that is rejected, never a crash.
 * Throws InputError when the file itself is unusable (empty, no header, required columns missing);
 * bad rows go to `sink.bad` with file:line.
 */
export function readCsvFile(file: string, sink: CsvSink, onBytes?: (n: number) => void): number {
  const p = new RowParser(file, sink);
  const buf = Buffer.allocUnsafe(READ_BYTES);
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch {
    throw new InputError([{ where: file, rule: 'cannot open the file' }]);
  }
  let rest = '';
  try {
    for (let n = readSync(fd, buf, 0, READ_BYTES, null); n > 0; n = readSync(fd, buf, 0, READ_BYTES, null)) {
      const text = rest + buf.toString('latin1', 0, n);
      let start = 0;
      // Searched once per chunk, not per line: most files hold no quote at all.
      let quote = text.indexOf('"');
      for (let nl = text.indexOf('\n'); nl >= 0; nl = text.indexOf('\n', start)) {
        if (quote >= 0 && quote < start) quote = text.indexOf('"', start);
        p.take(text, start, text.charCodeAt(nl - 1) === 13 ? nl - 1 : nl, quote >= 0 && quote < nl);
        start = nl + 1;
      }
      rest = text.slice(start);
      onBytes?.(n);
    }
  } finally {
    closeSync(fd);
  }
  if (rest.trim() !== '')
    p.take(rest, 0, rest.endsWith('\r') ? rest.length - 1 : rest.length, rest.includes('"'));
  if (p.line === 0) throw new InputError([{ where: file, rule: 'empty file (no header row)' }]);
  return p.rows;
}
