import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Sample } from '@thermargin/shared';
import { beforeAll, describe, expect, it } from 'vitest';
import { CSV_COLUMNS, csvRow } from '../../services/simulator/src/csv.ts';
import {
  candumpLine,
  framesFleet,
  sendsEngineFrames,
  vehicleFrames,
} from '../../services/simulator/src/frames.ts';
import { EXPORT_COLUMNS, EXPORT_MAP, exportRow } from '../../services/simulator/src/logger-export.ts';
import { createScenario } from '../../services/simulator/src/scenario.ts';
import { runCli, tempFiles } from '../support/run-cli.ts';

/** One simulated bus, one day: the same samples written as the import format, a logger's export and frames. */
const sc = createScenario({ seed: 7, vehicles: 1, days: 1 });
const samples: Sample[] = [...sc.vehicleSamples('bus-01')];
const FLEET = JSON.stringify(sc.fleet);

const loggerExport = (rows: readonly Sample[]) =>
  `${[EXPORT_COLUMNS.join(';'), ...rows.map(exportRow)].join('\n')}\n`;
const MAP = EXPORT_MAP;

type Report = {
  vehicles: {
    id: string;
    status?: string;
    unassessed?: string;
    trips: { start: string; k_ram_w_m2k: number | null; k_fan_w_m2k: number | null }[];
  }[];
  rejected: { total: number };
};

function analyze(dir: string, data: string, ...extra: string[]) {
  const r = runCli(['analyze', '--fleet', join(dir, 'fleet.json'), '--data', join(dir, data), ...extra]);
  const json = r.code === 0 && !extra.includes('--format');
  return { ...r, report: json ? (JSON.parse(r.stdout) as Report) : undefined };
}

/** Per-trip k of two reports agree within `rel` and the statuses are equal. */
function expectSameResult(a: Report, b: Report, rel: number) {
  expect(b.vehicles.map((v) => v.status)).toEqual(a.vehicles.map((v) => v.status));
  a.vehicles.forEach((v, i) => {
    const w = b.vehicles[i]!;
    expect(w.trips.map((t) => t.start)).toEqual(v.trips.map((t) => t.start));
    v.trips.forEach((t, j) => {
      for (const k of ['k_ram_w_m2k', 'k_fan_w_m2k'] as const) {
        const u = w.trips[j]![k];
        if (t[k] === null) expect(u).toBeNull();
        else expect(Math.abs(u! / t[k] - 1)).toBeLessThan(rel);
      }
    });
  });
}

describe('thermargin analyze with a mapping: a logger export as it comes', () => {
  let dir = '';
  let reference: Report;
  beforeAll(() => {
    dir = tempFiles({
      'fleet.json': FLEET,
      'map.json': JSON.stringify(MAP),
      'contract.csv': `${[CSV_COLUMNS.join(','), ...samples.map(csvRow)].join('\n')}\n`,
      'export.csv': loggerExport(samples),
    });
    reference = analyze(dir, 'contract.csv').report!;
    expect(reference.vehicles[0]!.trips.length).toBeGreaterThan(2);
  });

  it('reads semicolons, decimal commas, local time, °F, mph, W and a fraction, giving the same trips and k', () => {
    const r = analyze(dir, 'export.csv', '--map', join(dir, 'map.json'));
    expect(r.code).toBe(0);
    expect(r.report!.rejected.total).toBe(reference.rejected.total);
    // Not bit for bit (0.852 read back from "0,852" × 100 need not be 85.2 exactly), but within 1e-9.
    expectSameResult(reference, r.report!, 1e-9);
  });

  it('draft-map proposes a mapping that, once its zone is set, reads the export to the same result', () => {
    const d = runCli(['draft-map', '--data', join(dir, 'export.csv')]);
    expect(d.code).toBe(0);
    expect(d.stderr).toContain('check: Zeitstempel: local times without a zone');
    const draft = JSON.parse(d.stdout);
    // What the notes ask to check, settled from the logger's documentation.
    expect(d.stderr).toMatch(/check: EngCoolTemp: its name gives no unit; values [\d.]+–[\d.]+ read as °C/);
    expect(d.stderr).toMatch(
      /check: Durchfluss: its name gives no unit; values [\d.]+–[\d.]+ read as L\/min/,
    );
    draft.time.zone = 'Europe/Vienna';
    draft.fields.EngCoolTemp.unit = '°F';
    draft.fields.KuehlerAus.unit = '°F';
    draft.fields.Durchfluss.unit = 'US gal/min';
    writeFileSync(join(dir, 'draft.json'), JSON.stringify(draft));
    const r = analyze(dir, 'export.csv', '--map', join(dir, 'draft.json'));
    expect(r.code).toBe(0);
    expectSameResult(reference, r.report!, 1e-9);
  });

  it('sizing reads the export through the mapping to the same figures as the import format', () => {
    const size = (data: string, ...extra: string[]) =>
      runCli(['sizing', '--fleet', join(dir, 'fleet.json'), '--data', join(dir, data), ...extra]);
    const a = size('contract.csv');
    const b = size('export.csv', '--map', join(dir, 'map.json'));
    expect([a.code, b.code]).toEqual([0, 0]);
    const [ra, rb] = [JSON.parse(a.stdout), JSON.parse(b.stdout)];
    expect(rb.period).toEqual(ra.period);
    expect(rb.vehicles.length).toBe(ra.vehicles.length);
    const refused = runCli(['sizing', '--from-store', '--map', join(dir, 'map.json')]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/--map: not with --from-store/);
  });

  it('without the mapping says which columns are missing and points at --map', () => {
    const r = analyze(dir, 'export.csv');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /export\.csv:1: missing column\(s\) time, speed_kmh, power_kw, coolant_in_c, ambient_c, fan_pct, vehicle .*header has: Zeitstempel, Fahrzeug.*see --map/,
    );
  });

  it('a °F column under the import format’s name: ten rows by file:line, what the values look like, unassessed', () => {
    const hot = samples.slice(0, 400).map((s) => ({ ...s, coolant_in_c: 151 + ((s.time_ms / 1000) % 59) }));
    writeFileSync(join(dir, 'fahrenheit.csv'), `${[CSV_COLUMNS.join(','), ...hot.map(csvRow)].join('\n')}\n`);
    const r = analyze(dir, 'fahrenheit.csv', '--format', 'text');
    expect(r.code).toBe(0);
    const lines = r.stderr.trim().split('\n');
    expect(
      lines
        .slice(0, 10)
        .every((l) =>
          /fahrenheit\.csv:\d+: row refused: coolant_in_c_out_of_range \(\d+(\.\d+)? outside -50…150\)/.test(
            l,
          ),
        ),
    ).toBe(true);
    expect(lines[10]).toMatch(
      /fahrenheit\.csv: 400 of 400 rows refused: coolant_in_c values 151–209: a °F column\? see --map$/,
    );
    expect(lines[11]).toBe('… 390 more bad rows skipped (counted in rejected.by_reason)');
    expect(r.stdout).toMatch(
      /^bus-01 +unassessed +no usable samples: 400 coolant_in_c_out_of_range \(coolant_in_c values 151–209: a °F column\? see --map\)/,
    );
    expect(r.stdout).not.toMatch(/\bok\b/);
  });
});

describe('thermargin analyze on candump logs of SAE J1939 frames', () => {
  it('a vehicle’s log, with its mapping in the fleet file, gives the same result as its samples', () => {
    const fleet = framesFleet(sc.fleet);
    const frames = [...vehicleFrames(samples, sendsEngineFrames(fleet.vehicles[0]!))];
    const dir = tempFiles({
      'fleet.json': JSON.stringify(fleet),
      'contract.csv': `${[CSV_COLUMNS.join(','), ...samples.map(csvRow)].join('\n')}\n`,
    });
    mkdirSync(join(dir, 'logs', 'bus-01'), { recursive: true });
    writeFileSync(
      join(dir, 'logs', 'bus-01', 'candump-2026-07-31_000000.log'),
      `${frames.map(candumpLine).join('\n')}\n`,
    );
    const csv = analyze(dir, 'contract.csv').report!;
    const r = analyze(dir, 'logs');
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(
      /candump-2026-07-31_000000\.log: [\d,]+ frames: [\d,]+ decoded, 0 of unknown PGNs/,
    );
    expectSameResult(csv, r.report!, 1e-12);
  });

  it('names truncated, non-hex and odd lines by file:line and keeps every good frame', () => {
    const fleet = framesFleet(sc.fleet);
    const frames = [...vehicleFrames(samples.slice(0, 600), false)].map(candumpLine);
    frames.splice(
      10,
      0,
      '(1785456000.0) can0 18FEEE00#7DF',
      'not a frame at all',
      '(1785456000.1) can0 18FEEE00#ZZ',
    );
    frames[20] = frames[20]!.slice(0, 30); // cut in the middle of the identifier
    const dir = tempFiles({ 'fleet.json': JSON.stringify(fleet), 'bus-01.log': `${frames.join('\n')}\n` });
    const r = analyze(dir, 'bus-01.log');
    expect(r.code).toBe(0);
    const log = join(dir, 'bus-01.log');
    expect(r.stderr).toContain(`${log}:11: row skipped: candump_syntax`);
    expect(r.stderr).toContain(`${log}:12: row skipped: candump_syntax`);
    expect(r.stderr).toContain(`${log}:13: row skipped: candump_syntax`);
    expect(r.stderr).toContain(`${log}:21: row skipped: candump_syntax`);
    expect(r.report!.rejected.total).toBeGreaterThanOrEqual(4);
  });

  it('holds a candump log to the same --max-line-bytes as a table, with the same message', () => {
    const fleet = framesFleet(sc.fleet);
    const frames = [...vehicleFrames(samples.slice(0, 60), false)].map(candumpLine);
    frames[5] = `${frames[5]} ${'0'.repeat(200)}`;
    const dir = tempFiles({ 'fleet.json': JSON.stringify(fleet), 'bus-01.log': `${frames.join('\n')}\n` });
    const r = analyze(dir, 'bus-01.log', '--max-line-bytes', '128');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      `${join(dir, 'bus-01.log')}:6: line longer than 128 bytes (no line break within it); if the file is right, raise --max-line-bytes`,
    );
  });
});

describe('a mapping file that cannot be used is refused, naming the field', () => {
  it('unknown units and signals', () => {
    const dir = tempFiles({
      'fleet.json': FLEET,
      'map.json': JSON.stringify({
        fields: {
          EngCoolTemp: { signal: 'coolant_in_c', unit: '°X' },
          Foo: { signal: 'coolant', unit: '°C' },
        },
      }),
      'data.csv': 'a,b\n1,2\n',
    });
    const r = analyze(dir, 'data.csv', '--map', join(dir, 'map.json'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      'map.json: fields.EngCoolTemp.unit: "°X" is not a unit of temperature for coolant_in_c (one of °C, °F, K, degC, degF)',
    );
    expect(r.stderr).toMatch(
      /map\.json: fields\.Foo\.signal: "coolant" is not a signal \(one of speed_kmh, /,
    );
  });

  it('a delimiter it forces that the file does not use: the header read as one column names the separator', () => {
    const dir = tempFiles({
      'fleet.json': FLEET,
      'map.json': JSON.stringify({ delimiter: ';' }),
      'data.csv': 'time,vehicle,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct\n',
    });
    const r = analyze(dir, 'data.csv', '--map', join(dir, 'map.json'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      "data.csv:1: the header has one column: is the separator ','? The mapping sets delimiter ';': change or remove it",
    );
  });
});
