import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { DESIGN_NOTE, POWERTRAIN_HAZARDS } from '@thermargin/shared';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli, tempFiles } from '../support/run-cli.ts';
import { SIZING_FLEET } from '../support/sizing-fleet/fleet.ts';
import { writeSizingFleet } from '../support/sizing-fleet/write-fleet.ts';

/** Two vehicles, 40 days each (one cleaning on day 20): small enough for a quick run. */
const SPECS = SIZING_FLEET.filter((s) => s.id === 'c-1' || s.id === 'l-1').map((s) => ({
  ...s,
  days: 40,
  cleaned_on: [0, 20],
}));

let dir: string;
let paths: { fleet: string; data: string };

beforeAll(() => {
  dir = tempFiles({});
  paths = writeSizingFleet(dir, SPECS);
});

describe('thermargin sizing', () => {
  it('writes the JSON result and a self-contained HTML report', () => {
    const out = join(dir, 'result.json');
    const html = join(dir, 'report.html');
    const r = runCli([
      'sizing',
      '--fleet',
      paths.fleet,
      '--data',
      paths.data,
      '--out',
      out,
      '--html',
      html,
      '--what-if',
      '0,15',
    ]);
    expect(r.stderr).toMatch(/sized 2 vehicles from 72,000 rows, 80 trips/);
    expect(r.code).toBe(0);
    const res = JSON.parse(readFileSync(out, 'utf8'));
    expect(res.schema).toBe('thermargin.sizing/1');
    expect(res.vehicles.map((v: { id: string }) => v.id)).toEqual(['c-1', 'l-1']);
    expect(res.types.map((t: { group: string }) => t.group)).toEqual(['city', 'line']);
    expect(res.options.what_if).toEqual([
      { ambient_rise_k: 0, limit_drop_k: 0 },
      { ambient_rise_k: 0, limit_drop_k: 15 },
    ]);
    expect(res.vehicles[0].derate.events).toBe(4);
    expect(res.vehicles[0].fouling[0].segments).toHaveLength(2);

    const page = readFileSync(html, 'utf8');
    expect(page.startsWith('<!doctype html>')).toBe(true);
    expect(page).toContain(DESIGN_NOTE.slice(0, 60));
    // The caution names the hazards of the fleet's own powertrains, and only those.
    const kinds = new Set(res.vehicles.map((v: { powertrain: string }) => v.powertrain));
    for (const [kind, hazards] of Object.entries(POWERTRAIN_HAZARDS))
      expect(page.includes(hazards.slice(0, 40)), kind).toBe(kinds.has(kind));
    expect(res.safety_caution).toContain('qualified technicians');
    expect(res.design_note).toBe(DESIGN_NOTE);
    expect(page).toContain('Method and sources');
    expect(page).toContain('What if');
    expect(page.match(/<svg /g)!.length).toBeGreaterThanOrEqual(5);
    expect(page).not.toMatch(/<script|<link|<img|src=|href=|url\(/i);
  });

  it('refuses bad options with exit 2, saying which', () => {
    const r = runCli([
      'sizing',
      '--fleet',
      paths.fleet,
      '--data',
      paths.data,
      '--what-if',
      'hot',
      '--duty',
      'mass=3',
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--what-if hot: must be RISE,DROP in K/);
    expect(r.stderr).toMatch(/--duty mass=3: must be key=number/);
    const drop = runCli(['sizing', '--fleet', paths.fleet, '--data', paths.data, '--what-if', '0,40']);
    expect(drop.code).toBe(2);
    expect(drop.stderr).toMatch(/at or below its thermostat opening/);
    expect(runCli(['sizing', '--data', paths.data]).stderr).toMatch(/--fleet: required/);
  });

  it('refuses --from-store when the stores are not there, naming them, and creates nothing', () => {
    const empty = tempFiles({});
    const samples = join(empty, 'samples.db');
    const r = runCli(['sizing', '--from-store', '--fleet', paths.fleet], {
      STORE_KIND: 'sqlite',
      STORE_SQLITE_PATH: samples,
      RESULTS_SQLITE_PATH: join(empty, 'results.db'),
    });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`no sample store (STORE_SQLITE_PATH) at ${samples}`);
    expect(r.stderr).toMatch(/results database \(RESULTS_SQLITE_PATH\)/);
    expect(r.stderr).toMatch(/set STORE_KIND/);
    expect(readdirSync(empty)).toEqual([]);
  });
});
