import { dataMapSchema } from '@thermargin/shared';
import { standardPgns } from '@thermargin/logger-data/j1939/config';
import { draftFramesMap, draftTableMap } from '@thermargin/logger-data/table/draft';
import { describe, expect, it } from 'vitest';

const rows = (n: number, row: (i: number) => string[]) => Array.from({ length: n }, (_, i) => row(i));

describe('a mapping drafted from a table', () => {
  it('finds time, vehicle and signal columns by name and values, with units, and says what it guessed', () => {
    const names = [
      'Zeitstempel',
      'Fzg',
      'Geschw_mph',
      'Leistung_W',
      'EngCoolTemp',
      'Aussen_F',
      'Luefter',
      'Notiz',
    ];
    const body = rows(20, (i) => [
      `01.07.2026 10:00:${String(i).padStart(2, '0')}`,
      'bus-01',
      '31,2',
      '25000',
      String(180 + i),
      '86',
      '0,5',
      'x',
    ]);
    const d = draftTableMap(names, body, { delimiter: ';', decimal: ',' }, 'export.csv');
    expect(dataMapSchema.safeParse(d.map).success).toBe(true);
    expect(d.map).toMatchObject({
      delimiter: ';',
      decimal: ',',
      time: { field: 'Zeitstempel', form: 'local', zone: 'UTC', date_order: 'dmy' },
      vehicle: { field: 'Fzg' },
      fields: {
        Geschw_mph: { signal: 'speed_kmh', unit: 'mph' },
        Leistung_W: { signal: 'power_kw', unit: 'W' },
        EngCoolTemp: { signal: 'coolant_in_c', unit: '°F' },
        Aussen_F: { signal: 'ambient_c', unit: '°F' },
        Luefter: { signal: 'fan_pct', unit: 'fraction' },
      },
    });
    expect(d.notes).toContain(
      "Zeitstempel: local times without a zone: set time.zone to the logger's IANA zone (e.g. Europe/Vienna); UTC is a guess; day and month cannot be told apart in the rows read: dmy is a guess",
    );
    expect(d.notes).toContain(
      'EngCoolTemp: values 180–199 are implausible as °C for coolant_in_c; read as °F',
    );
    expect(d.notes).toContain('not mapped (ignored on import): Notiz');
  });

  it('leaves the import format’s own columns out of the draft and names what it could not place', () => {
    const names = ['time', 'vehicle', 'speed_kmh', 'fan_pct', 'mystery'];
    const body = rows(5, (i) => [`2026-07-01T10:00:0${i}Z`, 'bus-01', '50', '20', '7']);
    const d = draftTableMap(names, body, { delimiter: ',', decimal: '.' }, 'a.csv');
    expect(d.map.fields).toBeUndefined();
    expect(d.map.time).toEqual({ field: 'time', form: 'iso8601' });
    expect(d.notes).toEqual([
      'no column found for coolant_in_c: map one by hand',
      'no column found for ambient_c: map one by hand',
      'no column found for power_kw: map one by hand',
      'not mapped (ignored on import): mystery',
    ]);
  });

  it('reads epoch times by their size', () => {
    const d = draftTableMap(['ts'], [['1717250602500']], { delimiter: ',', decimal: '.' }, 'a.csv');
    expect(d.map.time).toEqual({ field: 'ts', form: 'epoch_ms' });
  });
});

describe('a mapping drafted from the PGNs of a candump log', () => {
  it('pins a parameter sent by two sources and lists the PGNs nothing reads', () => {
    const d = draftFramesMap(
      [
        { pgn: 65262, source: 0, length: 8, frames: 100 },
        { pgn: 65262, source: 1, length: 8, frames: 40 },
        { pgn: 65265, source: 0, length: 8, frames: 1000 },
        { pgn: 65269, source: 0, length: 8, frames: 100 },
        { pgn: 65213, source: 0, length: 8, frames: 100 },
        { pgn: 65312, source: 39, length: 8, frames: 100 },
      ],
      standardPgns(),
      'x.log',
    );
    expect(d.map.frames).toEqual({ source_address: { coolant_in_c: 0 } });
    expect(d.notes).toEqual([
      'coolant_in_c: sent by sources 0, 1; pinned to 0, the most frequent (check which is the one you want)',
      'power_kw: no EEC1 (engine speed and torque) in the log: an electric drivetrain needs its traction power defined under frames.signals',
      'PGN 65312 (0xFF20) from source 39, 8 bytes, 100 frames: not read; if it carries radiator outlet temperature, coolant flow, a derate flag or traction power, define it under frames.signals',
    ]);
  });
});
