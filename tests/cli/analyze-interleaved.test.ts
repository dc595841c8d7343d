import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { writeCsv } from '../../services/simulator/src/csv.ts';
import { createScenario } from '../../services/simulator/src/scenario.ts';
import { runCli, tempFiles } from '../support/run-cli.ts';

/**
 * A fleet export interleaves its vehicles in one time-ordered file; per-vehicle files hold the same
 * rows. Both must give the same result byte for byte, with each vehicle's buffer analysed and released
 * many times along the way (3 days at 1 Hz is many flushes).
 */
describe('thermargin analyze on one interleaved fleet file', () => {
  it('equals the result on one file per vehicle', () => {
    const sc = createScenario({ seed: 3, vehicles: 3, days: 3 });
    const split = tempFiles({});
    writeCsv(split, sc);
    const rows: string[] = [];
    let header = '';
    for (const f of readdirSync(split).filter((n) => n.endsWith('.csv'))) {
      const [h, ...lines] = readFileSync(join(split, f), 'utf8').trimEnd().split('\n');
      header = h!;
      rows.push(...lines);
    }
    // ISO times in the first column: text order is time order.
    rows.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
    const merged = join(tempFiles({}), 'fleet-export');
    mkdirSync(merged);
    writeFileSync(join(merged, 'all.csv'), `${header}\n${rows.join('\n')}\n`);
    expect(rows.length).toBeGreaterThan(3 * 20_000);

    const fleet = join(split, 'fleet.json');
    const a = runCli(['analyze', '--fleet', fleet, '--data', split]);
    const b = runCli(['analyze', '--fleet', fleet, '--data', merged]);
    expect(a.code, a.stderr).toBe(0);
    expect(b.code, b.stderr).toBe(0);
    expect(
      JSON.parse(a.stdout).vehicles.flatMap((v: { trips: unknown[] }) => v.trips).length,
    ).toBeGreaterThan(6);
    expect(b.stdout).toBe(a.stdout);
  });
});
