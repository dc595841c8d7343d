import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fleetSchema, NUMERIC_COLUMNS, type Sample } from '@thermargin/shared';
import { afterAll, describe, expect, it } from 'vitest';
import { readCsvFile } from '../../../services/cli/src/import/csv-reader.ts';
import { CSV_COLUMNS, isoTime, writeCsv } from '../../../services/simulator/src/csv.ts';
import { main } from '../../../services/simulator/src/main.ts';
import { createScenario } from '../../../services/simulator/src/scenario.ts';

const dirs: string[] = [];
const tempDir = () => {
  const d = mkdtempSync(join(tmpdir(), 'sim-csv-'));
  dirs.push(d);
  return d;
};
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

describe('writeCsv', () => {
  it('round-trips every value through the import reader, empty cells as missing', async () => {
    const sc = createScenario({ days: 1, vehicles: 3 });
    const range = { from_ms: sc.history.from_ms, to_ms: sc.history.from_ms + 10 * 3_600_000 };
    const dir = tempDir();
    const r = writeCsv(dir, sc, range);
    expect(r.files.map((f) => f.slice(dir.length + 1))).toEqual([
      'bus-01.csv',
      'bus-02.csv',
      'bus-03.csv',
      'fleet.json',
    ]);
    expect(fleetSchema.parse(JSON.parse(readFileSync(join(dir, 'fleet.json'), 'utf8')))).toEqual(sc.fleet);
    expect(readFileSync(join(dir, 'bus-03.csv'), 'utf8').split('\n', 1)[0]).toBe(CSV_COLUMNS.join(','));

    for (const id of ['bus-01', 'bus-03']) {
      const expected: Sample[] = [...sc.vehicleSamples(id, range)];
      expect(expected.length).toBeGreaterThan(1000);
      const rows: { vehicle: string; values: number[]; trip: string | undefined }[] = [];
      const bad: string[] = [];
      await readCsvFile(join(dir, `${id}.csv`), {
        sample: (vehicle, values, trip) => rows.push({ vehicle, values: [...values], trip }),
        bad: (where, reason) => bad.push(`${where}: ${reason}`),
      });
      expect(bad).toEqual([]);
      expect(rows.length).toBe(expected.length);
      rows.forEach((row, i) => {
        const s = expected[i]!;
        if (row.vehicle !== id || row.trip !== s.trip)
          throw new Error(`${id} row ${i}: ids ${row.vehicle} ${row.trip}`);
        NUMERIC_COLUMNS.forEach((name, k) => {
          const want = name === 'time_ms' ? s.time_ms : (s[name] ?? Number.NaN);
          if (row.values[k] !== want && !(Number.isNaN(want) && Number.isNaN(row.values[k]!)))
            throw new Error(`${id} row ${i} ${name}: read ${row.values[k]}, wrote ${want}`);
        });
      });
    }
  });

  it('formats times as ISO 8601 UTC', () => {
    for (const t of [
      Date.UTC(2026, 6, 4, 5, 54, 2),
      Date.UTC(2026, 6, 4, 23, 59, 59),
      Date.UTC(2026, 6, 4, 5, 54, 7, 5),
    ])
      expect(Date.parse(isoTime(t))).toBe(t);
    expect(isoTime(Date.UTC(2026, 6, 4, 5, 54, 2))).toBe('2026-07-04T05:54:02Z');
  });

  it('has a CLI that writes the files and reports the speed', () => {
    const dir = tempDir();
    const log: string[] = [];
    const orig = console.log;
    console.log = (...a: unknown[]) => log.push(a.join(' '));
    try {
      main(['--out', dir, '--seed', '3', '--vehicles', '2', '--days', '1', '--end', '2026-07-15']);
    } finally {
      console.log = orig;
    }
    expect(log[0]).toMatch(/^wrote \d+ samples for 2 vehicles .* samples\/s\)$/);
    const fleet = fleetSchema.parse(JSON.parse(readFileSync(join(dir, 'fleet.json'), 'utf8')));
    expect(fleet.vehicles.map((v) => v.id)).toEqual(['bus-01', 'bus-02']);
    expect(() => main(['--out', dir, '--days', 'x'])).toThrow(/--days must be an integer/);
    expect(() => main([])).toThrow(/--out is required/);
  });
});
