import { truncateSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { safetyCaution } from '@thermargin/shared';
import { runCli, tempFiles } from '../support/run-cli.ts';
import { BUS_CONFIG } from '../support/vehicle-fixture.ts';

const FLEET = JSON.stringify({ vehicles: [BUS_CONFIG] });
const HEADER = 'time,vehicle,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct';
const row = (i: number, over = '') =>
  over || `${new Date(Date.UTC(2026, 6, 1, 8) + i * 1000).toISOString()},bus-01,85,60,80,35,0`;

function analyze(csv: string, format = 'json') {
  const dir = tempFiles({ 'fleet.json': FLEET, 'data.csv': csv });
  return runCli([
    'analyze',
    '--fleet',
    join(dir, 'fleet.json'),
    '--data',
    join(dir, 'data.csv'),
    '--format',
    format,
  ]);
}

describe('thermargin analyze on bad input', () => {
  it('refuses an empty file with exit 2 and says which file', () => {
    const r = analyze('');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/data\.csv: empty file/);
  });

  it('refuses a header without the required columns, naming them and the line', () => {
    const r = analyze('when,vehicle,speed\n1,bus-01,3\n');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /data\.csv:1: missing column\(s\) time, speed_kmh, power_kw, coolant_in_c, ambient_c, fan_pct/,
    );
  });

  it('names the separator of a header that reads as one column', () => {
    const r = analyze(`${HEADER.replaceAll(',', '|')}\n${row(0).replaceAll(',', '|')}\n`);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("the header has one column: is the separator '|'?");
  });

  it('skips and counts bad rows with file:line while keeping the good ones', () => {
    const lines = [
      HEADER,
      row(0),
      `${row(1).replace(',60,', ',sixty,')}`,
      row(2).replace(',85,', ',NaN,'),
      row(3),
      'x,y',
    ];
    const r = analyze(`${lines.join('\n')}\n`);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/data\.csv:3: row skipped: csv_not_a_number:power_kw/);
    expect(r.stderr).toMatch(/data\.csv:4: row skipped: csv_not_a_number:speed_kmh/);
    expect(r.stderr).toMatch(/data\.csv:6: row skipped: csv_short_row/);
    const out = JSON.parse(r.stdout);
    expect(out.rejected.by_reason).toEqual({
      'csv_not_a_number:power_kw': 1,
      'csv_not_a_number:speed_kmh': 1,
      csv_short_row: 1,
    });
    expect(out.vehicles[0].trips[0].samples).toBe(2);
  });

  it('counts huge values, unsorted and duplicated rows; a single-row trip gives nulls, not numbers', () => {
    const lines = [HEADER, row(5), row(1), row(1), row(3).replace(',60,', ',1e300,'), row(2000)];
    const r = analyze(`${lines.join('\n')}\n`);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.rejected.by_reason).toEqual({ duplicate_time: 1, power_kw_out_of_range: 1 });
    const trips = out.vehicles[0].trips;
    expect(trips.map((t: { samples: number }) => t.samples)).toEqual([2, 1]);
    expect(trips[1].k_ram_w_m2k).toBeNull();
    expect(trips[1].k_ram_reason).toMatch(/ram band/);
    expect(trips[1].margin_pct).toBeNull();
  });

  it('fails with exit 2 when no row is usable, and on a fleet file that breaks the schema', () => {
    expect(analyze(`${HEADER}\nfoo,bar,1,2,3,4,5\n`).code).toBe(2);
    const dir = tempFiles({ 'fleet.json': '{"vehicles":[]}', 'data.csv': `${HEADER}\n${row(0)}\n` });
    const r = runCli(['analyze', '--fleet', join(dir, 'fleet.json'), '--data', dir]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/fleet\.json: vehicles: vehicles must list at least one vehicle/);
  });

  it('writes one CSV row per trip with the vehicle first', () => {
    const r = analyze(`${[HEADER, row(0), row(1)].join('\n')}\n`, 'csv');
    const lines = r.stdout.trim().split('\n');
    // The fuel-cell caution first, as comment lines a CSV reader's comment option skips.
    const notes = lines.filter((l) => l.startsWith('# '));
    expect(notes.map((l) => l.slice(2)).join('\n')).toBe(safetyCaution(['fcev']));
    const [head, first] = lines.slice(notes.length);
    expect(
      head!.startsWith('vehicle,trip,start,end,samples,rejected,distance_km,k_ram_w_m2k,k_ram_ci95_lo'),
    ).toBe(true);
    expect(first!.startsWith('bus-01,20260701T080000Z,2026-07-01T08:00:00Z,2026-07-01T08:00:01Z,2,0,')).toBe(
      true,
    );
  });

  it('lists a trip too short to judge as such, and never judges it', () => {
    const r = analyze(`${[HEADER, row(0), row(1)].join('\n')}\n`);
    expect(r.code, r.stderr).toBe(0);
    const v = JSON.parse(r.stdout).vehicles[0];
    expect(v.trips).toHaveLength(1);
    expect(v.trips[0].too_short).toBe(true);
    expect(v.trips[0].status).toBeUndefined();
    expect(v.status).toBeUndefined(); // nothing judged: the vehicle stays unassessed
  });

  it("carries the caution for the fleet's powertrains in its JSON", () => {
    const r = analyze(`${[HEADER, row(0), row(1)].join('\n')}\n`);
    expect(r.code, r.stderr).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(json.safety_caution).toBe(safetyCaution(['fcev']));
    expect(json.safety_caution).toMatch(/hydrogen/);
    expect(json.safety_caution).not.toMatch(/engine-driven fan/);
  });

  it('says "required" for a fleet-file field left out, and "must be a number" for one of the wrong kind', () => {
    const { heat_kw: _, ...design } = BUS_CONFIG.design;
    const dir = tempFiles({
      'fleet.json': JSON.stringify({
        vehicles: [
          { ...BUS_CONFIG, design },
          { ...BUS_CONFIG, id: 'bus-02', radiator_area_m2: 'big' },
        ],
      }),
      'data.csv': `${HEADER}\n${row(0)}\n`,
    });
    const r = runCli(['analyze', '--fleet', join(dir, 'fleet.json'), '--data', dir]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/vehicles\[0\]\.design\.heat_kw: design\.heat_kw is required/);
    expect(r.stderr).toMatch(/vehicles\[1\]\.radiator_area_m2: radiator_area_m2 must be a number/);
  });

  it('answers --help of every command with its own usage and exit 0', () => {
    for (const command of ['analyze', 'sizing', 'draft-map', 'reanalyze']) {
      const r = runCli([command, '--help']);
      expect(r.code, command).toBe(0);
      expect(r.stdout.startsWith(`thermargin ${command} `), command).toBe(true);
      expect(r.stderr).toBe('');
    }
  });

  it('puts the reason first, on one line, then the usage', () => {
    const r = runCli(['analyze', '--fleet', 'f.json', '--data', 'd.csv', '--format', 'xml']);
    expect(r.code).toBe(2);
    const [reason, blank, usage] = r.stderr.split('\n');
    expect(reason).toBe('thermargin analyze: --format: must be one of json, csv, text');
    expect([blank, usage]).toEqual(['', 'usage:']);
    const d = runCli(['draft-map', '--rows', '0']);
    expect(d.code).toBe(2);
    expect(d.stderr.split('\n').slice(0, 3)).toEqual([
      'thermargin draft-map: --data: required; --rows: must be an integer ≥ 1',
      '',
      'usage:',
    ]);
  });

  it('answers an unknown command or option with usage and exit 2', () => {
    expect(runCli(['frobnicate']).code).toBe(2);
    const r = runCli(['analyze', '--colour', 'red']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/usage/);
  });

  it('refuses a line over the limit with exit 2 at its file:line, without reading it all (no line break anywhere, or a runaway row)', () => {
    // 64 MiB of one line: the old reader grew its buffer to hold it; now the first read ends it.
    const dir = tempFiles({ 'fleet.json': FLEET });
    const runaway = join(dir, 'runaway.csv');
    writeFileSync(runaway, `${HEADER}\n${row(0)}\n`);
    truncateSync(runaway, 64 << 20); // zeros to the end: a third line without a line break
    const noBreak = join(dir, 'nobreak.csv');
    writeFileSync(noBreak, 'time');
    truncateSync(noBreak, 64 << 20);
    for (const [file, line] of [
      [runaway, 3],
      [noBreak, 1],
    ] as const) {
      const r = runCli(['analyze', '--fleet', join(dir, 'fleet.json'), '--data', file]);
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toContain(`${file}:${line}: line longer than 1048576 bytes`);
      expect(r.stderr).toContain('--max-line-bytes');
    }
    const raised = runCli([
      'analyze',
      '--fleet',
      join(dir, 'fleet.json'),
      '--data',
      noBreak,
      '--max-line-bytes',
      '0x10',
    ]);
    expect(raised.code).toBe(2);
    expect(raised.stderr).toMatch(/--max-line-bytes: must be a whole number of bytes/);
  });

  it('refuses a header naming a column twice, naming both positions', () => {
    const r = analyze(
      `time,vehicle,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct,speed_kmh\n${row(0)},9\n`,
    );
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/data\.csv:1: column speed_kmh appears twice \(columns 3 and 8\)/);
  });

  it('reads decimal numbers only: 0x10, Infinity and 1_0 are not numbers, 1e1 and .5 are', () => {
    const lines = [
      HEADER,
      row(0).replace(',85,', ',0x10,'),
      row(1).replace(',85,', ',Infinity,'),
      row(2).replace(',85,', ',1_0,'),
      row(3).replace(',85,', ',1e1,'),
      row(4).replace(',85,', ',.5,'),
    ];
    const r = analyze(`${lines.join('\n')}\n`);
    expect(r.code).toBe(0);
    for (const line of [2, 3, 4])
      expect(r.stderr).toContain(`data.csv:${line}: row skipped: csv_not_a_number:speed_kmh`);
    expect(JSON.parse(r.stdout).vehicles[0].trips[0].samples).toBe(2);
  });
});
