import { dataMapSchema, type TimeMap } from '@thermargin/shared';
import { detectDialect } from '@thermargin/logger-data/table/dialect';
import { tableLayout } from '@thermargin/logger-data/table/layout';
import { timeReader } from '@thermargin/logger-data/table/time-forms';
import { rangeHint } from '@thermargin/logger-data/table/unit-hint';
import { mapValue, valueMap } from '@thermargin/logger-data/units';
import { describe, expect, it } from 'vitest';

describe('unit conversions, each by its definition (NIST SP 811, 2008, appendix B.8; SI Brochure 2019)', () => {
  const to = (unit: Parameters<typeof valueMap>[0], x: number, scale?: number, offset?: number) =>
    mapValue(valueMap(unit, scale, offset), x);
  it('temperature: °F by (t − 32) / 1.8, K by T − 273.15', () => {
    expect(to('°F', 212)).toBe(100);
    expect(to('°F', -40)).toBe(-40);
    expect(to('°F', 98.6)).toBe(37);
    expect(to('K', 373.15)).toBe(100);
  });
  it('speed: the international mile 1609.344 m, m/s × 3.6', () => {
    expect(to('mph', 60)).toBe(96.56064);
    expect(to('m/s', 10)).toBe(36);
  });
  it('power: W ÷ 1000, mechanical horsepower 550 ft·lbf/s = 745.699 871 582 270 22 W', () => {
    expect(to('W', 2500)).toBe(2.5);
    expect(to('hp', 1000)).toBeCloseTo(745.6998715822702, 12);
  });
  it('flow: the US gallon 3.785 411 784 L, m³/h × 1000 ÷ 60', () => {
    expect(to('US gal/min', 10)).toBeCloseTo(37.85411784, 12);
    expect(to('m³/h', 6)).toBe(100);
  });
  it('share: a fraction × 100; scale and offset apply before the unit', () => {
    expect(to('fraction', 0.5)).toBe(50);
    expect(to('°F', 2120, 0.1)).toBe(100);
    expect(to('°C', 130, 1, -40)).toBe(90);
  });
});

describe('time forms', () => {
  const read = (map: TimeMap, text: string) => timeReader(map)(Buffer.from(text, 'latin1'), 0, text.length);
  it('ISO 8601 with an offset; without one it is refused (the zone would be a guess)', () => {
    expect(read({ field: 't', form: 'iso8601' }, '2024-06-01T14:03:22+02:00')).toBe(
      Date.UTC(2024, 5, 1, 12, 3, 22),
    );
    expect(read({ field: 't', form: 'iso8601' }, '2024-06-01 14:03:22.5Z')).toBe(
      Date.UTC(2024, 5, 1, 14, 3, 22, 500),
    );
    expect(read({ field: 't', form: 'iso8601' }, '2024-06-01T14:03:22')).toBeNaN();
  });
  it('epoch seconds, milliseconds and microseconds', () => {
    expect(read({ field: 't', form: 'epoch_s' }, '1717250602.5')).toBe(1717250602500);
    expect(read({ field: 't', form: 'epoch_ms' }, '1717250602500')).toBe(1717250602500);
    expect(read({ field: 't', form: 'epoch_us' }, '1717250602500000')).toBe(1717250602500);
    expect(read({ field: 't', form: 'epoch_s' }, '1.7e9')).toBeNaN();
  });
  it('local time in an IANA zone (tz database through Intl): summer and winter offsets, skipped and repeated hours', () => {
    const vienna = (text: string, date_order?: 'dmy' | 'mdy') =>
      read({ field: 't', form: 'local', zone: 'Europe/Vienna', ...(date_order ? { date_order } : {}) }, text);
    expect(vienna('2024-06-01 14:03:22')).toBe(Date.UTC(2024, 5, 1, 12, 3, 22));
    expect(vienna('01.12.2024 14:03:22', 'dmy')).toBe(Date.UTC(2024, 11, 1, 13, 3, 22));
    // 2024-03-31 02:00–03:00 does not exist in Central Europe (clocks go to 03:00 at 01:00 UTC).
    expect(vienna('2024-03-31 02:30:00')).toBeNaN();
    expect(vienna('2024-03-31 03:00:00')).toBe(Date.UTC(2024, 2, 31, 1));
    // 2024-10-27 02:00–03:00 happens twice: read as the first, still summer time (UTC+2).
    expect(vienna('2024-10-27 02:30:00')).toBe(Date.UTC(2024, 9, 27, 0, 30));
    expect(vienna('2024-10-27 03:30:00')).toBe(Date.UTC(2024, 9, 27, 2, 30));
    expect(
      read(
        { field: 't', form: 'local', zone: 'America/New_York', date_order: 'mdy' },
        '6/1/2024 08:00:00,25',
      ),
    ).toBe(Date.UTC(2024, 5, 1, 12, 0, 0, 250));
    expect(vienna('31.06.2024 10:00:00', 'dmy')).toBeNaN();
  });
});

describe('delimiter and decimal mark from the file', () => {
  it('semicolons with decimal commas, tabs, plain commas', () => {
    expect(detectDialect('a;b;c', ['1,5;2;3,25'])).toEqual({ delimiter: ';', decimal: ',' });
    expect(detectDialect('a;b;c', ['1.5;2;3.25'])).toEqual({ delimiter: ';', decimal: '.' });
    expect(detectDialect('a\tb\tc', ['1,5\t2\t3'])).toEqual({ delimiter: '\t', decimal: ',' });
    expect(detectDialect('a,b,c', ['1.5,2,3'])).toEqual({ delimiter: ',', decimal: '.' });
    expect(detectDialect('"a;x",b,c', [])).toEqual({ delimiter: ',', decimal: '.' });
  });
  it('what the mapping states wins', () => {
    expect(detectDialect('a;b', ['1,5;2'], { decimal: '.' })).toEqual({ delimiter: ';', decimal: '.' });
    expect(detectDialect('a;b', [], { delimiter: ',' })).toEqual({ delimiter: ',', decimal: '.' });
  });
});

describe('a table layout from a header and a mapping', () => {
  const dialect = { delimiter: ',' as const, decimal: '.' as const };
  const map = dataMapSchema.parse({
    time: { field: 'ts', form: 'epoch_s' },
    vehicle: { id: 'bus-01' },
    fields: { T_F: { signal: 'coolant_in_c', unit: '°F' }, v: { signal: 'speed_kmh', unit: 'km/h' } },
  });
  it('maps the named columns, falls back to the import format’s names, converts only where needed', () => {
    const l = tableLayout(
      ['ts', 'v', 'power_kw', 'T_F', 'ambient_c', 'fan_pct', 'coolant_in_c'],
      dialect,
      map,
      'f.csv',
    );
    expect(l.numeric).toEqual([0, 1, 2, 3, -1, 4, 5, -1, -1]);
    expect(l.maps[0]).toBeNull(); // km/h, scale 1: nothing to do
    expect(l.maps[2]).not.toBeNull();
    expect(l.vehicle_id).toBe('bus-01');
  });
  it('lists every missing column in one line naming the header', () => {
    expect(() => tableLayout(['ts', 'v'], dialect, map, 'f.csv')).toThrow(
      'f.csv:1: missing column(s) power_kw, T_F (coolant_in_c), ambient_c, fan_pct; header has: ts, v',
    );
  });
  it('refuses two columns for one signal, naming the field', () => {
    const twice = dataMapSchema.parse({
      fields: { a: { signal: 'fan_pct', unit: '%' }, b: { signal: 'fan_pct', unit: 'fraction' } },
    });
    expect(() => tableLayout(['a', 'b'], dialect, twice, 'f.csv')).toThrow(
      'mapping fields.b: fan_pct is already carried by a',
    );
  });
});

describe('what refused values look like', () => {
  it('names the unit under which the whole range is plausible', () => {
    expect(rangeHint('coolant_in_c', 150, 210)).toBe('coolant_in_c values 150–210: a °F column? see --map');
    expect(rangeHint('power_kw', 50_000, 180_000)).toBe(
      'power_kw values 50000–180000: a W column? see --map',
    );
    expect(rangeHint('fan_pct', 0, 250)).toBe(
      "fan_pct values 0–250, outside 0…100 %: check the column's unit or scale (see --map)",
    );
  });
});
