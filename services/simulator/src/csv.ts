import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { type Sample, SIGNAL_NAMES, type VehicleConfigInput } from '@thermargin/shared';
import type { Scenario, TimeRange } from './scenario.ts';

/** The import format's columns, in the order written: time, vehicle, trip, then the contract's signals. */
export const CSV_COLUMNS = ['time', 'vehicle', 'trip', ...SIGNAL_NAMES] as const;

let minuteKey = Number.NaN;
let minutePrefix = '';

/** ISO 8601 UTC text of a time, `2026-07-04T05:54:42Z` (milliseconds only when not whole); the minute's
 *  text is cached, since samples come 60 to a minute. */
export function isoTime(t_ms: number): string {
  const minute = Math.floor(t_ms / 60_000);
  if (minute !== minuteKey) {
    minuteKey = minute;
    minutePrefix = new Date(minute * 60_000).toISOString().slice(0, 17);
  }
  const ms = t_ms - minute * 60_000;
  if (ms % 1000 !== 0) return `${minutePrefix}${(ms / 1000).toFixed(3).padStart(6, '0')}Z`;
  const sec = ms / 1000;
  return `${minutePrefix}${sec < 10 ? '0' : ''}${sec}Z`;
}

/** One CSV row (no newline): time as ISO 8601 UTC, numbers as JavaScript prints them (they read back exactly). */
export function csvRow(s: Sample): string {
  let row = `${isoTime(s.time_ms)},${s.vehicle},${s.trip ?? ''}`;
  for (const name of SIGNAL_NAMES) {
    const v = s[name];
    row += v === undefined ? ',' : `,${v}`;
  }
  return row;
}

/** Rows buffered before each write: large enough that the system call cost vanishes. */
const ROWS_PER_WRITE = 20_000;

export interface CsvWriteResult {
  /** Paths written: one CSV per vehicle, then fleet.json. */
  files: string[];
  samples: number;
}

/** What a writer says of each vehicle's file: its extension and its lines (header first, if any). */
export interface PerVehicleFormat {
  ext: string;
  lines: (vehicle: VehicleConfigInput, samples: Iterable<Sample>) => Iterable<string>;
  /** JSON files written beside the data (name → content), the fleet file among them. */
  json: readonly (readonly [string, unknown])[];
}

/** One file per vehicle, written in large pieces, then the JSON files: what every writer of the demo shares. */
export function writePerVehicle(
  dir: string,
  scenario: Scenario,
  range: TimeRange | undefined,
  format: PerVehicleFormat,
): CsvWriteResult {
  mkdirSync(dir, { recursive: true });
  const files: string[] = [];
  let samples = 0;
  for (const v of scenario.fleet.vehicles) {
    const path = join(dir, `${v.id}.${format.ext}`);
    const counted = (function* () {
      for (const s of scenario.vehicleSamples(v.id, range)) {
        samples++;
        yield s;
      }
    })();
    const fd = openSync(path, 'w');
    try {
      let buf: string[] = [];
      for (const line of format.lines(v, counted)) {
        buf.push(line);
        if (buf.length >= ROWS_PER_WRITE) {
          writeSync(fd, `${buf.join('\n')}\n`);
          buf = [];
        }
      }
      if (buf.length) writeSync(fd, `${buf.join('\n')}\n`);
    } finally {
      closeSync(fd);
    }
    files.push(path);
  }
  for (const [name, data] of format.json) {
    writeFileSync(join(dir, name), `${JSON.stringify(data, null, 2)}\n`);
    files.push(join(dir, name));
  }
  return { files, samples };
}

/**
 * Writes the scenario in the import format: `<dir>/<vehicle>.csv` (header row, one sample a row,
 * empty cell = missing signal) for the range (default: the history), and `<dir>/fleet.json`.
 */
export function writeCsv(dir: string, scenario: Scenario, range?: TimeRange): CsvWriteResult {
  return writePerVehicle(dir, scenario, range, {
    ext: 'csv',
    *lines(_v, samples) {
      yield CSV_COLUMNS.join(',');
      for (const s of samples) yield csvRow(s);
    },
    json: [['fleet.json', scenario.fleet]],
  });
}
