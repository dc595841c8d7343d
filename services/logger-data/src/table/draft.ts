import {
  type DataMap,
  type FieldMap,
  ID_PATTERN,
  SIGNAL_QUANTITY,
  SIGNALS,
  type SignalName,
  type TimeMap,
  UNITS,
  type Unit,
} from '@thermargin/shared';
import { mapValue, ownUnit, valueMap } from '../units.ts';
import type { Dialect } from './dialect.ts';

/** A proposed mapping and what the proposal is unsure of, in words, one line each. */
export interface Draft {
  map: DataMap;
  notes: string[];
}

/** Column names that suggest a signal (English and German spellings loggers use; our own list). */
const NAME_HINTS: [SignalName, RegExp][] = [
  ['coolant_out_c', /(rad|radiator|k(ü|ue)hler).*(out|aus)|outlet|bottom.?tank|ruecklauf|rücklauf/i],
  ['coolant_in_c', /cool|k(ü|ue)hl|\bect\b|water.?temp|wassertemp|top.?tank|vorlauf/i],
  ['ambient_c', /amb|outside|au(ss|ß)en|\boat\b|air.?temp|lufttemp|umgeb/i],
  ['fan_pct', /fan|l(ü|ue)fter/i],
  ['coolant_flow_lpm', /flow|durchfluss|\blpm\b|\bgpm\b|volumenstrom/i],
  ['derate', /derat|drossel|limit/i],
  ['power_kw', /power|leistung|\bkw\b|watt|\bhp\b|\bps\b/i],
  ['speed_kmh', /speed|geschw|veloc|\bkmh\b|\bkm\/h\b|\bmph\b|tempo/i],
];
/** Unit spellings in column names. */
const UNIT_HINTS: [Unit, RegExp][] = [
  ['°F', /(°|deg|_|\b)f\b|fahrenheit/i],
  ['K', /kelvin|\[k\]|_k\b/i],
  ['mph', /mph/i],
  ['m/s', /m\/s|mps\b/i],
  ['W', /\bw\b|_w\b|watt|\[w\]/i],
  ['hp', /\bhp\b|_hp\b/i],
  ['US gal/min', /gpm|gal/i],
  ['m³/h', /m3\/h|m³\/h|m3h/i],
  ['fraction', /frac|ratio/i],
];
const TIME_NAME = /time|zeit|date|datum|\bts\b|utc|stamp/i;
const VEHICLE_NAME = /vehicle|fahrzeug|\bunit\b|asset|\bvin\b|truck|\bbus\b|\bvan\b|kennzeichen|fzg/i;

interface ColumnStats {
  name: string;
  numbers: number[];
  texts: string[];
}

const ISO_OFFSET = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}(:?\d{2})?)$/;
const ISO_LOCAL = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}([.,]\d+)?)?$/;
const NUMERIC_DATE = /^(\d{1,4})[./-](\d{1,2})[./-](\d{1,4})[T ]\d{1,2}:\d{2}/;

/** The time form a column's texts are written in, or null; plus what is unsure about it. */
function timeForm(c: ColumnStats): { time: TimeMap; note?: string } | null {
  const t = c.texts.filter((x) => x !== '');
  if (t.length === 0) return null;
  if (t.every((x) => ISO_OFFSET.test(x))) return { time: { field: c.name, form: 'iso8601' } };
  const zoneNote = `${c.name}: local times without a zone: set time.zone to the logger's IANA zone (e.g. Europe/Vienna); UTC is a guess`;
  if (t.every((x) => ISO_LOCAL.test(x)))
    return { time: { field: c.name, form: 'local', zone: 'UTC' }, note: zoneNote };
  if (t.every((x) => NUMERIC_DATE.test(x))) {
    const parts = t.map((x) => NUMERIC_DATE.exec(x)!.slice(1, 4).map(Number) as [number, number, number]);
    const yearFirst = parts.every((p) => p[0] > 31);
    const firstOver12 = parts.some((p) => p[0] > 12);
    const secondOver12 = parts.some((p) => p[1] > 12);
    const date_order = yearFirst ? 'ymd' : firstOver12 ? 'dmy' : secondOver12 ? 'mdy' : 'dmy';
    const order =
      !yearFirst && !firstOver12 && !secondOver12
        ? `; day and month cannot be told apart in the rows read: dmy is a guess`
        : '';
    return { time: { field: c.name, form: 'local', zone: 'UTC', date_order }, note: `${zoneNote}${order}` };
  }
  if (c.numbers.length === t.length) {
    const x = c.numbers[0]!;
    const form = x > 1e14 ? 'epoch_us' : x > 1e11 ? 'epoch_ms' : x > 1e8 ? 'epoch_s' : null;
    if (form) return { time: { field: c.name, form } };
  }
  return null;
}

/** A unit for the signal: from the column's name, else the one under which the values look plausible. */
function unitFor(signal: SignalName, c: ColumnStats, notes: string[]): Unit {
  if (c.name === signal) return ownUnit(signal); // the import format's own name carries its unit
  const allowed = UNITS[SIGNAL_QUANTITY[signal]] as readonly Unit[];
  const named = UNIT_HINTS.find(([u, re]) => allowed.includes(u) && re.test(c.name));
  if (named) return named[0];
  if (c.numbers.length === 0) return ownUnit(signal);
  const min = Math.min(...c.numbers);
  const max = Math.max(...c.numbers);
  const spec = SIGNALS[signal];
  const fits = (u: Unit) => {
    const m = valueMap(u);
    return mapValue(m, min) >= spec.min && mapValue(m, max) <= spec.max;
  };
  const own = ownUnit(signal);
  if (signal === 'fan_pct' && max <= 1 && min >= 0) {
    notes.push(`${c.name}: values ${min}–${max} read as a fraction 0–1 (say % if the fan never exceeds 1 %)`);
    return 'fraction';
  }
  if (fits(own)) {
    if (allowed.length > 1)
      notes.push(`${c.name}: its name gives no unit; values ${min}–${max} read as ${own} (${signal}'s own)`);
    return own;
  }
  const other = allowed.find((u) => u !== own && !/deg|m3/.test(u) && fits(u));
  notes.push(
    other
      ? `${c.name}: values ${min}–${max} are implausible as ${own} for ${signal}; read as ${other}`
      : `${c.name}: values ${min}–${max} are implausible for ${signal} in any unit of the list: check scale and offset`,
  );
  return other ?? own;
}

/**
 * A mapping proposed from a table's header and first rows: the time column and its form, the vehicle
 * column, and for each signal the column whose name and values fit it best, with a unit. Columns it
 * cannot place and everything it guessed are said in `notes`; the map is a draft for the user to edit.
 */
export function draftTableMap(
  names: readonly string[],
  rows: readonly string[][],
  dialect: Dialect,
  source: string,
): Draft {
  const notes: string[] = [];
  const columns: ColumnStats[] = names.map((name, i) => {
    const texts = rows.map((r) => (r[i] ?? '').trim());
    const numbers = texts
      .filter((t) => t !== '')
      .map((t) => Number(dialect.decimal === ',' ? t.replace(',', '.') : t))
      .filter((x) => Number.isFinite(x));
    return { name, numbers, texts };
  });
  const used = new Set<string>();
  const map: DataMap = { description: `drafted from ${source}: check every entry before use` };
  if (dialect.delimiter !== ',') map.delimiter = dialect.delimiter === '\t' ? 'tab' : dialect.delimiter;
  if (dialect.decimal !== '.') map.decimal = dialect.decimal;

  const timed = columns
    .filter((c) => TIME_NAME.test(c.name))
    .concat(columns.filter((c) => !TIME_NAME.test(c.name)))
    .map((c) => ({ c, t: timeForm(c) }))
    .find((x) => x.t !== null);
  if (timed?.t) {
    map.time = timed.t.time;
    if (timed.t.note) notes.push(timed.t.note);
    used.add(timed.c.name);
  } else
    notes.push('no column reads as a time (ISO 8601, epoch, or a local date and time): set time by hand');

  const vehicle = columns.find(
    (c) => !used.has(c.name) && VEHICLE_NAME.test(c.name) && c.texts.every((t) => ID_PATTERN.test(t)),
  );
  if (vehicle) {
    if (vehicle.name !== 'vehicle') map.vehicle = { field: vehicle.name };
    used.add(vehicle.name);
  } else
    notes.push('no vehicle column: the file or its folder must be named for the vehicle, or set vehicle.id');

  const fields: Record<string, FieldMap> = {};
  for (const [signal, re] of NAME_HINTS) {
    const c = columns.find(
      (x) => !used.has(x.name) && (x.name === signal || re.test(x.name)) && x.numbers.length,
    );
    if (!c) {
      if (SIGNALS[signal].required) notes.push(`no column found for ${signal}: map one by hand`);
      continue;
    }
    used.add(c.name);
    const unit = unitFor(signal, c, notes);
    if (c.name !== signal || unit !== ownUnit(signal)) fields[c.name] = { signal, unit };
  }
  if (Object.keys(fields).length) map.fields = fields;
  const left = columns.filter((c) => !used.has(c.name) && c.name !== 'trip').map((c) => c.name);
  if (left.length) notes.push(`not mapped (ignored on import): ${left.join(', ')}`);
  return { map, notes };
}

/** Frames of one PGN from one source with one data length, as counted in a log. */
export interface PgnSeen {
  pgn: number;
  source: number;
  length: number;
  frames: number;
}

/**
 * A mapping proposed for a candump log from the PGNs it holds: which standard parameters are there
 * (pinned to one source address where several send them), what is missing for the required signals,
 * and the PGNs nothing reads — candidates for `frames.signals` definitions, which only the logger's or
 * the vehicle maker's documentation can give.
 */
export function draftFramesMap(
  seen: readonly PgnSeen[],
  standard: ReadonlyMap<number, { signal: SignalName; name: string }>,
  source: string,
): Draft {
  const notes: string[] = [];
  const map: DataMap = { description: `drafted from ${source}: check every entry before use`, frames: {} };
  const pinned: Partial<Record<SignalName, number>> = {};
  const found = new Set<SignalName>();
  const bySignal = new Map<SignalName, PgnSeen[]>();
  for (const s of seen) {
    const std = standard.get(s.pgn);
    if (!std) continue;
    found.add(std.signal);
    bySignal.set(std.signal, [...(bySignal.get(std.signal) ?? []), s]);
  }
  for (const [signal, list] of bySignal) {
    const sources = [...new Set(list.map((s) => s.source))];
    if (sources.length > 1) {
      const main = list.reduce((a, b) => (b.frames > a.frames ? b : a));
      pinned[signal] = main.source;
      notes.push(
        `${signal}: sent by sources ${sources.join(', ')}; pinned to ${main.source}, the most frequent (check which is the one you want)`,
      );
    }
  }
  if (Object.keys(pinned).length) map.frames!.source_address = pinned;
  for (const signal of Object.keys(SIGNALS) as SignalName[])
    if (SIGNALS[signal].required && !found.has(signal))
      notes.push(
        signal === 'power_kw'
          ? 'power_kw: no EEC1 (engine speed and torque) in the log: an electric drivetrain needs its traction power defined under frames.signals'
          : `${signal}: no standard message for it in the log: define it under frames.signals`,
      );
  const unknown = seen.filter((s) => !standard.has(s.pgn)).sort((a, b) => b.frames - a.frames);
  for (const s of unknown.slice(0, 20))
    notes.push(
      `PGN ${s.pgn} (0x${s.pgn.toString(16).toUpperCase()}) from source ${s.source}, ${s.length} bytes, ${s.frames} frames: not read; if it carries radiator outlet temperature, coolant flow, a derate flag or traction power, define it under frames.signals`,
    );
  if (unknown.length > 20) notes.push(`… and ${unknown.length - 20} more PGNs not read`);
  return { map, notes };
}
