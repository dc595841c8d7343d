import type { DataMap, Sample } from '@thermargin/shared';
import { type CsvWriteResult, writePerVehicle } from './csv.ts';
import type { Scenario, TimeRange } from './scenario.ts';

/**
 * The demo as an invented data logger exports it, to show (and test) reading a logger's own table
 * through a mapping: semicolons, decimal commas, local time in Vienna written day first, its own column
 * names, °F, mph, W, US gal/min and the fan as a fraction. `EXPORT_MAP` is the mapping that reads it.
 */
export const EXPORT_COLUMNS = [
  'Zeitstempel',
  'Fahrzeug',
  'Geschw_mph',
  'Leistung_W',
  'EngCoolTemp',
  'KuehlerAus',
  'Durchfluss',
  'Aussen_F',
  'Luefter',
  'Drossel',
  'Notiz',
] as const;

export const EXPORT_MAP: DataMap = {
  description: 'demo data logger export: local time in Vienna, °F, mph, W, US gal/min, fan as a fraction',
  time: { field: 'Zeitstempel', form: 'local', zone: 'Europe/Vienna', date_order: 'dmy' },
  vehicle: { field: 'Fahrzeug' },
  fields: {
    Geschw_mph: { signal: 'speed_kmh', unit: 'mph' },
    Leistung_W: { signal: 'power_kw', unit: 'W' },
    EngCoolTemp: { signal: 'coolant_in_c', unit: '°F' },
    KuehlerAus: { signal: 'coolant_out_c', unit: '°F' },
    Durchfluss: { signal: 'coolant_flow_lpm', unit: 'US gal/min' },
    Aussen_F: { signal: 'ambient_c', unit: '°F' },
    Luefter: { signal: 'fan_pct', unit: 'fraction' },
    Drossel: { signal: 'derate', unit: '0/1' },
  },
};

const vienna = new Intl.DateTimeFormat('en-GB', {
  timeZone: 'Europe/Vienna',
  hourCycle: 'h23',
  year: 'numeric',
  month: '2-digit',
  day: '2-digit',
  hour: '2-digit',
  minute: '2-digit',
  second: '2-digit',
});
let hourKey = Number.NaN;
let hourPrefix = '';

/** `01.07.2026 10:00:00`: the local time in Vienna, day first (the hour's text cached). */
function localTime(ms: number): string {
  const hour = Math.floor(ms / 3_600_000);
  if (hour !== hourKey) {
    hourKey = hour;
    const p = Object.fromEntries(vienna.formatToParts(hour * 3_600_000).map((x) => [x.type, x.value]));
    hourPrefix = `${p.day}.${p.month}.${p.year} ${p.hour}:`;
  }
  const s = Math.floor((ms % 3_600_000) / 1000);
  return `${hourPrefix}${String(Math.floor(s / 60)).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
}

const comma = (x: number | undefined) => (x === undefined ? '' : String(x).replace('.', ','));
const fahrenheit = (c: number | undefined) => (c === undefined ? undefined : (c * 9) / 5 + 32);

/** One row of the export (no newline). */
export function exportRow(s: Sample): string {
  return [
    localTime(s.time_ms),
    s.vehicle,
    comma(s.speed_kmh / 1.609344),
    comma(s.power_kw * 1000),
    comma(fahrenheit(s.coolant_in_c)),
    comma(fahrenheit(s.coolant_out_c)),
    comma(s.coolant_flow_lpm === undefined ? undefined : s.coolant_flow_lpm / 3.785411784),
    comma(fahrenheit(s.ambient_c)),
    comma(s.fan_pct / 100),
    comma(s.derate),
    'ok',
  ].join(';');
}

/** Writes `<dir>/<vehicle>.csv` as the logger exports them, `<dir>/map.json` and `<dir>/fleet.json`. */
export function writeLoggerExport(dir: string, scenario: Scenario, range?: TimeRange): CsvWriteResult {
  return writePerVehicle(dir, scenario, range, {
    ext: 'csv',
    *lines(_v, samples) {
      yield EXPORT_COLUMNS.join(';');
      for (const s of samples) yield exportRow(s);
    },
    json: [
      ['map.json', EXPORT_MAP],
      ['fleet.json', scenario.fleet],
    ],
  });
}
