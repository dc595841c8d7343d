import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Sample } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { CSV_COLUMNS, csvRow } from '../../services/simulator/src/csv.ts';
import {
  candumpLine,
  framesFleet,
  sendsEngineFrames,
  vehicleFrames,
} from '../../services/simulator/src/frames.ts';
import { createScenario } from '../../services/simulator/src/scenario.ts';
import { runCli, tempFiles } from '../support/run-cli.ts';

const table = (rows: readonly Sample[], extra: string[] = []) =>
  `${[CSV_COLUMNS.join(','), ...rows.map(csvRow), ...extra].join('\n')}\n`;

describe('thermargin analyze on several threads gives what one thread gives', () => {
  it('per-vehicle files, a file of two vehicles (read again on one thread), bad rows, a candump log', () => {
    const sc = createScenario({ seed: 4, vehicles: 5, days: 1 });
    const fleet = framesFleet(sc.fleet);
    const ids = fleet.vehicles.map((v) => v.id);
    const of = (id: string) => [...sc.vehicleSamples(id)];
    const dir = tempFiles({ 'fleet.json': JSON.stringify(fleet) });
    const data = join(dir, 'data');
    mkdirSync(join(data, 'mixed'), { recursive: true });
    // vehicle 0: its own file with bad rows and an unknown vehicle; vehicle 1: split over its file and a
    // mixed file that also holds vehicle 2's second half; vehicle 3 as frames; vehicle 4 plain.
    const [a, b, c, d, e] = ids.map(of);
    const half = (s: Sample[]) => Math.floor(s.length / 2);
    writeFileSync(
      join(data, `${ids[0]}.csv`),
      table(a!, ['garbage', `${csvRow(a![5]!)},extra`, csvRow({ ...a![9]!, vehicle: 'nobody' })]),
    );
    writeFileSync(join(data, `${ids[1]}.csv`), table(b!.slice(0, half(b!))));
    writeFileSync(join(data, `${ids[2]}.csv`), table(c!.slice(0, half(c!))));
    writeFileSync(
      join(data, 'mixed', 'later.csv'),
      table([...b!.slice(half(b!)), ...c!.slice(half(c!))].sort((x, y) => x.time_ms - y.time_ms)),
    );
    const v3 = fleet.vehicles[3]!;
    writeFileSync(
      join(data, `${ids[3]}.log`),
      `${[...vehicleFrames(d!, sendsEngineFrames(v3))].map(candumpLine).join('\n')}\n`,
    );
    writeFileSync(join(data, `${ids[4]}.csv`), table(e!));
    const run = (threads: number) =>
      runCli(['analyze', '--fleet', join(dir, 'fleet.json'), '--data', data, '--threads', String(threads)]);
    const one = run(1);
    expect(one.code).toBe(0);
    expect(JSON.parse(one.stdout).vehicles.every((v: { trips: unknown[] }) => v.trips.length > 0)).toBe(true);
    for (const threads of [2, 3]) {
      const many = run(threads);
      expect(many.code).toBe(0);
      expect(many.stdout).toBe(one.stdout);
      expect(many.stderr).toBe(one.stderr);
    }
  });
});
