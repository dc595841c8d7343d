import {
  type DataMap,
  InputError,
  NUMERIC_COLUMNS,
  type Problem,
  SIGNALS,
  type SignalName,
  type Unit,
} from '@thermargin/shared';
import { isIdentity, type ValueMap, valueMap } from '../units.ts';
import type { Dialect } from './dialect.ts';
import { type TimeReader, timeReader } from './time-forms.ts';

/** Where each value of a table's rows is, and how it becomes a sample's value. */
export interface TableLayout {
  /** Delimiter and decimal mark as bytes. */
  delimiter: number;
  decimal: number;
  /** Columns in the header. */
  width: number;
  /** Column of the vehicle id, or −1 when `vehicle_id` names the vehicle of every row. */
  vehicle: number;
  vehicle_id: string | null;
  /** Column of the trip id, −1 when absent. */
  trip: number;
  /** Column per NUMERIC_COLUMNS entry (time first), −1 when absent. */
  numeric: number[];
  /** Per NUMERIC_COLUMNS entry after time: the conversion into the signal's unit, null when none is needed. */
  maps: (ValueMap | null)[];
  /** Reads the time column; null: the import format's own (ISO 8601 UTC or epoch ms). */
  readTime: TimeReader | null;
}

/** A column a value is taken from, named twice in the header: which, and both positions (1-based). */
function repeatedColumns(where: string, names: readonly string[], used: readonly number[]): Problem[] {
  const out: Problem[] = [];
  for (const first of new Set(used)) {
    if (first < 0) continue;
    const second = names.indexOf(names[first]!, first + 1);
    if (second >= 0)
      out.push({
        where,
        rule: `column ${names[first]} appears twice (columns ${first + 1} and ${second + 1}): keep one`,
      });
  }
  return out;
}

const shown = (separator: string) => (separator === '\t' ? 'tab' : separator);

/**
 * The separator a header read as one column seems to use instead of the one it was split with: a
 * delimiter the mapping forces, or one no table is read with ('|').
 */
function otherSeparator(header: string, delimiter: string): string | undefined {
  const s = [',', ';', '\t', '|'].find((c) => c !== delimiter && header.includes(c));
  return s && shown(s);
}

/**
 * The layout of a table with this header under the mapping (or none: the import format's own names).
 * A mapped field wins over a column that happens to bear the signal's name; a signal not mapped is read
 * from a column of its own name when there is one. `vehicle_id` names the vehicle when the file belongs
 * to one (its path named it) and the table has no vehicle column. Throws InputError listing every problem
 * with the header's line (`file:1`) or the mapping's field.
 */
export function tableLayout(
  names: readonly string[],
  dialect: Dialect,
  map: DataMap | undefined,
  where: string,
  vehicle_id: string | null = null,
): TableLayout {
  const problems: Problem[] = [];
  const header = `${where}:1`;
  const index = new Map<string, number>();
  names.forEach((n, i) => {
    if (!index.has(n)) index.set(n, i);
  });
  const column = (name: string) => index.get(name) ?? -1;

  const bySignal = new Map<SignalName, { field: string; unit: Unit; scale?: number; offset?: number }>();
  for (const [field, f] of Object.entries(map?.fields ?? {})) {
    const other = bySignal.get(f.signal);
    if (other)
      problems.push({
        where: `mapping fields.${field}`,
        rule: `${f.signal} is already carried by ${other.field}`,
      });
    else bySignal.set(f.signal, { field, ...f, unit: f.unit as Unit });
  }

  const numeric: number[] = [];
  const maps: (ValueMap | null)[] = [];
  /** Required columns not found: by their own name, or as the mapping names them. */
  const missing: string[] = [];
  const timeField = map?.time?.field ?? 'time';
  numeric.push(column(timeField));
  if (numeric[0]! < 0) missing.push(map?.time ? `${timeField} (time)` : 'time');
  for (const name of NUMERIC_COLUMNS.slice(1) as SignalName[]) {
    const mapped = bySignal.get(name);
    const col = mapped ? column(mapped.field) : column(name);
    numeric.push(col);
    const m = mapped ? valueMap(mapped.unit, mapped.scale, mapped.offset) : null;
    maps.push(m && !isIdentity(m) ? m : null);
    if (col < 0 && SIGNALS[name].required) missing.push(mapped ? `${mapped.field} (${name})` : name);
  }

  let vehicle = -1;
  let fixed: string | null = null;
  const vehicleMap = map?.vehicle;
  if (vehicleMap && 'id' in vehicleMap) fixed = vehicleMap.id;
  else {
    const field = vehicleMap?.field ?? 'vehicle';
    vehicle = column(field);
    if (vehicle < 0) fixed = vehicle_id;
    if (vehicle < 0 && !fixed)
      missing.push(`${field} (or a file or folder named for a vehicle of the fleet file)`);
  }
  const trip = column(map?.trip?.field ?? 'trip');
  problems.push(...repeatedColumns(header, names, [numeric, vehicle, trip].flat()));
  const other = names.length === 1 ? otherSeparator(names[0]!, dialect.delimiter) : undefined;
  if (missing.length)
    problems.push({
      where: header,
      rule: other
        ? `the header has one column: is the separator '${other}'? ${
            map?.delimiter
              ? `The mapping sets delimiter '${shown(dialect.delimiter)}': change or remove it`
              : "Tables are read separated by ',', ';' or tab"
          }`
        : `missing column(s) ${missing.join(', ')}; header has: ${names.join(', ') || '(nothing)'}${
            map ? '' : ". A logger's own names and units: see --map"
          }`,
    });
  if (problems.length)
    throw new InputError(problems, `${where} cannot be read${map ? ' with the mapping' : ''}`);
  return {
    delimiter: dialect.delimiter.charCodeAt(0),
    decimal: dialect.decimal.charCodeAt(0),
    width: names.length,
    vehicle,
    vehicle_id: fixed,
    trip,
    numeric,
    maps,
    readTime: map?.time ? timeReader(map.time) : null,
  };
}
