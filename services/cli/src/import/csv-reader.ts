import { type DataMap, InputError, isValidId, NUMERIC_COLUMNS } from '@thermargin/shared';
import { detectDialect } from '@thermargin/logger-data/table/dialect';
import { type TableLayout, tableLayout } from '@thermargin/logger-data/table/layout';
import { mapValue } from '@thermargin/logger-data/units';
import { forEachLine, readHead } from '@thermargin/logger-data/io/lines';
import { readDecimal } from './decimal.ts';
import { fastTime_ms } from './iso-time.ts';

/** Receives what a CSV file holds: good rows as values in NUMERIC_COLUMNS order, bad rows with a reason. */
export interface CsvSink {
  sample(vehicle: string, values: Float64Array, trip: string | undefined, line: number): void;
  bad(where: string, reason: string): void;
}

/** How to read a file that is not in the import format: its mapping, and the vehicle its path names. */
export interface CsvOptions {
  map?: DataMap | undefined;
  vehicle_id?: string | null;
  /** bytes: the longest line read (default MAX_LINE_BYTES of logger-data/io/lines.ts, 1 MiB). */
  max_line_bytes?: number | undefined;
}

/** bytes of a file's head read to detect its delimiter and decimal mark. */
const HEAD_BYTES = 64 * 1024;

function layoutOf(file: string, header: string, head: string, o: CsvOptions): TableLayout {
  const dialect = detectDialect(header, head.split('\n').slice(1, 50), {
    ...(o.map?.delimiter ? { delimiter: o.map.delimiter === 'tab' ? '\t' : o.map.delimiter } : {}),
    ...(o.map?.decimal ? { decimal: o.map.decimal } : {}),
  });
  return tableLayout(headerNames(header, dialect.delimiter), dialect, o.map, file, o.vehicle_id ?? null);
}

/** A header line's column names, trimmed and without a byte-order mark (UTF-8 read as UTF-8 or Latin-1). */
export function headerNames(header: string, delimiter: string): string[] {
  return splitCsvLine(header, delimiter).map((h) => h.trim().replace(/^(\uFEFF|\u00EF\u00BB\u00BF)/, ''));
}

/** Splits one delimited line with double-quoted fields (RFC 4180 quoting). */
export function splitCsvLine(line: string, delimiter = ','): string[] {
  if (!line.includes('"')) return line.split(delimiter);
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
    else if (ch === delimiter) {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out;
}

/** JavaScript's trim() whitespace within Latin-1: tab, LF, VT, FF, CR, space, no-break space. */
const isBlank = (c: number) => c === 32 || (c >= 9 && c <= 13) || c === 160;

/** Field boundaries of the line s[start, end) into `from`/`to` (at most their length); returns the count. */
function fieldBounds(
  s: Uint8Array,
  start: number,
  end: number,
  from: Int32Array,
  to: Int32Array,
  delimiter: number,
): number {
  let f = 0;
  let pos = start;
  while (f < from.length) {
    let comma = pos;
    while (comma < end && s[comma] !== delimiter) comma++;
    from[f] = pos;
    to[f++] = comma;
    if (comma === end) break;
    pos = comma + 1;
  }
  return f;
}

/** Whether the bytes s[a, b) spell `text` (Latin-1). */
function spells(s: Uint8Array, a: number, b: number, text: string): boolean {
  if (b - a !== text.length) return false;
  for (let i = 0; i < text.length; i++) if (s[a + i] !== text.charCodeAt(i)) return false;
  return true;
}

/** A field as trimmed text, reusing the previous string when the bytes are the same (ids repeat row after row). */
function fieldText(s: Buffer, a: number, b: number, previous: string): string {
  return spells(s, a, b, previous) ? previous : s.toString('latin1', a, b).trim();
}

/** Parses the rows of one file from its bytes; positions of fields are kept in reusable arrays. */
class RowParser {
  private layout: TableLayout | null = null;
  private from = new Int32Array(0);
  private to = new Int32Array(0);
  private values = new Float64Array(NUMERIC_COLUMNS.length);
  /** The last valid vehicle id seen (repeats are not validated again). */
  private vehicle = '';
  /** The last trip id seen and whether it is valid (empty counts as valid: no trip given). */
  private trip = '';
  private tripOk = true;
  line = 0;
  rows = 0;

  constructor(
    private readonly file: string,
    private readonly sink: CsvSink,
    private readonly options: CsvOptions,
    private readonly head: string,
  ) {}

  /** One line: s[start, end); `quoted` when it holds a double quote. */
  take(s: Buffer, start: number, end: number, quoted: boolean): void {
    this.line++;
    if (this.line === 1) {
      this.layout = layoutOf(this.file, s.toString('latin1', start, end), this.head, this.options);
      this.from = new Int32Array(this.layout.width);
      this.to = new Int32Array(this.layout.width);
      if (this.layout.vehicle_id) this.vehicle = this.layout.vehicle_id;
      return;
    }
    if (end === start || (s[start]! <= 32 && isBlankLine(s, start, end))) return;
    if (quoted) {
      // Rare: rebuild the line unquoted, then read it like any other.
      const d = String.fromCharCode(this.layout!.delimiter);
      const fields = splitCsvLine(s.toString('latin1', start, end), d);
      if (fields.some((f) => f.includes(d))) {
        this.sink.bad(`${this.file}:${this.line}`, 'csv_comma_in_field');
        return;
      }
      const flat = Buffer.from(fields.join(d), 'latin1');
      this.row(flat, fieldBounds(flat, 0, flat.length, this.from, this.to, this.layout!.delimiter));
      return;
    }
    this.row(s, fieldBounds(s, start, end, this.from, this.to, this.layout!.delimiter));
  }

  private row(s: Buffer, fields: number): void {
    const l = this.layout!;
    const { from, to, values } = this;
    if (fields < l.width) {
      this.bad('csv_short_row');
      return;
    }
    if (l.vehicle >= 0) {
      const vehicle = fieldText(s, from[l.vehicle]!, to[l.vehicle]!, this.vehicle);
      if (vehicle !== this.vehicle && !isValidId(vehicle)) {
        this.bad('csv_bad_vehicle');
        return;
      }
      this.vehicle = vehicle;
    }
    const tc = l.numeric[0]!;
    let a = from[tc]!;
    let b = to[tc]!;
    while (a < b && isBlank(s[a]!)) a++;
    while (b > a && isBlank(s[b - 1]!)) b--;
    const time = l.readTime ? l.readTime(s, a, b) : fastTime_ms(s, a, b);
    if (!Number.isFinite(time)) {
      this.bad('csv_bad_time');
      return;
    }
    values[0] = time;
    for (let k = 1; k < l.numeric.length; k++) {
      const col = l.numeric[k]!;
      const x = col < 0 ? undefined : readDecimal(s, from[col]!, to[col]!, l.decimal);
      if (x === undefined) values[k] = Number.NaN;
      else if (Number.isNaN(x)) {
        this.bad(`csv_not_a_number:${NUMERIC_COLUMNS[k]}`);
        return;
      } else {
        const m = l.maps[k - 1];
        values[k] = m ? mapValue(m, x) : x;
      }
    }
    let trip: string | undefined;
    if (l.trip >= 0) {
      const text = fieldText(s, from[l.trip]!, to[l.trip]!, this.trip);
      if (text !== this.trip) {
        this.trip = text;
        this.tripOk = text === '' || isValidId(text);
      }
      if (!this.tripOk) {
        this.bad('csv_bad_trip');
        return;
      }
      trip = this.trip || undefined;
    }
    this.rows++;
    this.sink.sample(this.vehicle, values, trip, this.line);
  }

  private bad(reason: string): void {
    this.sink.bad(`${this.file}:${this.line}`, reason);
  }
}

/** Whether s[start, end) holds nothing but whitespace (such lines are skipped, not counted). */
function isBlankLine(s: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) if (!isBlank(s[i]!)) return false;
  return true;
}

/**
 * Reads one CSV file of the import format (header naming the contract's columns in any order,
 * unknown columns ignored, empty cell = missing), or a logger's own table read through a mapping
 * (its columns, units and time form; delimiter and decimal mark detected), into `sink`, chunk by chunk, parsing the bytes in
 * place (no string per line or field; only a changed id becomes a string). Read as Latin-1: every
 * valid field is ASCII, and a stray byte makes an invalid id or number that is rejected, never a crash.
 * Throws InputError when the file itself is unusable (empty, no header, required columns missing, a
 * line over `max_line_bytes`); bad rows go to `sink.bad` with file:line.
 */
export function readCsvFile(
  file: string,
  sink: CsvSink,
  onBytes?: (n: number) => void,
  options: CsvOptions = {},
): number {
  const p = new RowParser(file, sink, options, readHead(file, HEAD_BYTES));
  forEachLine(
    file,
    (s, start, end, _line, quoted) => p.take(s, start, end, quoted),
    onBytes,
    options.max_line_bytes,
  );
  if (p.line === 0) throw new InputError([{ where: file, rule: 'empty file (no header row)' }]);
  return p.rows;
}
