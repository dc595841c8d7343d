import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { answerDesign } from '@thermargin/core/sizing/calculator';
import { compareDrivetrains } from '@thermargin/core/sizing/drivetrain-compare';
import { DEFAULT_DUTY, type SizingResult } from '@thermargin/core/sizing/fleet-sizing';
import { median } from '@thermargin/core/stats/quantile';
import { DESIGN_NOTE, meResponseSchema, type Sample, safetyCaution } from '@thermargin/shared';
import {
  type CalculatorResponse,
  calculatorResponseSchema,
  type SizingResponse,
  sizingResponseSchema,
} from '@thermargin/shared/sizing-api';
import { createScenario, writeCsv } from '@thermargin/simulator';
import { createSqliteStore, type SqliteStore } from '@thermargin/store';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../support/run-cli.ts';
import { tempDir } from '../ingester/support.ts';
import { type ApiStack, startApiStack, type TOKENS } from './stack.ts';

/** Three vehicles over 20 days: enough trips for fouling fits, derates on the hot days. */
const scenario = createScenario({ vehicles: 3, days: 20, seed: 3 });
const IDS = scenario.fleet.vehicles.map((v) => v.id);
/** Written to the store only after the first read: its trips are the "new results" that must show. */
const LATE = IDS.at(-1)!;
const WHAT_IF = { ambient_rise_k: 8, limit_drop_k: 3 };
const dir = tempDir('api-sizing');
const csvDir = join(dir, 'csv');
let samples: SqliteStore;
let stack: ApiStack;
let now_ms = scenario.history.to_ms + 3_600_000;
/** What `thermargin sizing` writes for the same fleet file and samples: default options, and one what-if. */
let cli: SizingResult;
let cliWhatIf: SizingResult;

async function store(vehicle: string): Promise<void> {
  let batch: Sample[] = [];
  for (const s of scenario.vehicleSamples(vehicle)) {
    batch.push(s);
    if (batch.length === 20_000) {
      await samples.writeSamples(batch);
      batch = [];
    }
  }
  await samples.writeSamples(batch);
}

function sizingCli(out: string, ...extra: string[]): SizingResult {
  const r = runCli([
    'sizing',
    '--fleet',
    join(csvDir, 'fleet.json'),
    '--data',
    csvDir,
    '--out',
    out,
    ...extra,
  ]);
  expect(r.code, r.stderr).toBe(0);
  return figuresOf(out);
}

/** The figures of a `sizing --out` file, once its caution (for the fleet's powertrains) and design note are checked. */
function figuresOf(out: string): SizingResult {
  const { safety_caution, design_note, ...figures } = JSON.parse(readFileSync(out, 'utf8'));
  expect(design_note).toBe(DESIGN_NOTE);
  expect(safety_caution).toBe(cautionOf(figures));
  return figures as SizingResult;
}
const cautionOf = (r: SizingResult) => safetyCaution(r.vehicles.map((v) => v.powertrain));

const sizing = async () => {
  const res = await stack.get('/api/sizing');
  expect(res.status).toBe(200);
  return (await res.json()) as SizingResponse;
};
const calculate = (body: unknown, role: keyof typeof TOKENS = 'viewer') =>
  stack.send('POST', '/api/sizing/calculator', body, role);
const DESIGN = { ambient_c: 40, heat_kw: 20, coolant_limit_c: 120 };

beforeAll(async () => {
  writeCsv(csvDir, scenario);
  cli = sizingCli(join(dir, 'cli.json'));
  cliWhatIf = sizingCli(
    join(dir, 'cli-what-if.json'),
    '--what-if',
    `${WHAT_IF.ambient_rise_k},${WHAT_IF.limit_drop_k}`,
  );
  samples = createSqliteStore({ path: join(dir, 'samples.db'), synchronous: 'normal' });
  for (const id of IDS) if (id !== LATE) await store(id);
  stack = await startApiStack(dir, scenario.fleet, samples, () => now_ms);
  await stack.analyzer.runOnce();
}, 240_000);
afterAll(async () => {
  await stack?.close();
  await samples?.close();
});

describe('GET /api/sizing and POST /api/sizing/calculator against the stores', () => {
  it('serves the figures from the stores, cached until new trip results arrive, then equal to the CLI', async () => {
    const first = await sizing();
    expect(first.sizing.vehicles.find((v) => v.id === LATE)!.trips).toBe(0);
    now_ms += 1000;
    expect((await sizing()).computed_at).toBe(first.computed_at); // no new results: the kept figures

    await store(LATE);
    await stack.analyzer.runOnce();
    const body = await sizing();
    expect(body.computed_at).not.toBe(first.computed_at);
    expect(body.trips_without_samples).toBe(0);
    expect(body.safety_caution).toBe(cautionOf(cli));
    expect(body.design_note).toBe(DESIGN_NOTE);
    // Exactly what `thermargin sizing --data` wrote for the same samples, field for field.
    expect(body.sizing).toStrictEqual(cli);
    expect(cli.fleet.derate!.events).toBeGreaterThan(0);
    expect(cli.vehicles.every((v) => v.design_check !== null)).toBe(true);
    // The documented schema holds every field (parsing would drop an undocumented one).
    expect(sizingResponseSchema.parse(body)).toStrictEqual(body);
  });

  it('calculator: the design answer and drivetrain comparison are core’s, on the field k', async () => {
    const res = await calculate({ design: { ...DESIGN, area_m2: 0.3 }, duty: { speed_kmh: 100 } });
    expect(res.status).toBe(200);
    const body = calculatorResponseSchema.parse(await res.json()) as CalculatorResponse;
    const ks = cli.vehicles.map((v) => v.design_check!.k_design_w_m2k);
    const fitted = cli.vehicles
      .filter((v) => v.design_check!.allowance_source === 'fouling_fit')
      .map((v) => v.design_check!.fouling_allowance);
    const allowance = fitted.length ? median(fitted) : cli.options.default_fouling_allowance;
    expect(body.basis).toEqual({
      k_w_m2k: median(ks),
      k_source: 'field',
      fouling_allowance: allowance,
      allowance_source: fitted.length ? 'field' : 'default',
      vehicles: IDS,
    });
    expect(body.design).toEqual(
      answerDesign({ ...DESIGN, k_w_m2k: median(ks), fouling_allowance: allowance, area_m2: 0.3 }),
    );
    // On the fleet's own duty (the sizing figures'), with the speed asked for and the design's ambient.
    const { duty_source, duty_note, ...comparison } = body.drivetrains;
    expect(comparison).toEqual(
      compareDrivetrains({ ...cli.drivetrains.duty, speed_kmh: 100, ambient_c: 40 }, median(ks), allowance),
    );
    expect(duty_source).toEqual({ ...cli.drivetrains.duty_source, speed_kmh: 'given', ambient_c: 'given' });
    expect(duty_note).toBe(cli.drivetrains.duty_note);
    expect(cli.drivetrains.duty_source!.mass_kg).toBe('fleet_data');
    expect(cli.drivetrains.duty.mass_kg).not.toBe(DEFAULT_DUTY.mass_kg);
    expect(body.what_if).toBeNull();
    expect(body.safety_caution).toBe(cautionOf(cli));
    expect(body.design_note).toBe(DESIGN_NOTE);
  });

  it('calculator: the worked example of the trade (common practice): half the ITD, half the heat', async () => {
    const given = { k_w_m2k: 1000, fouling_allowance: 0, area_m2: 0.25 };
    const at120 = (await (await calculate({ design: { ...DESIGN, ...given } })).json()) as CalculatorResponse;
    expect(at120.basis).toMatchObject({ k_source: 'given', allowance_source: 'given' });
    expect(at120.design.itd_k).toBe(80);
    expect(at120.design.required_area_m2).toBeCloseTo(0.25, 12);
    expect(at120.design.supported_heat_kw).toBeCloseTo(20, 12);
    const at80 = (await (
      await calculate({ design: { ...DESIGN, ...given, coolant_limit_c: 80 } })
    ).json()) as CalculatorResponse;
    expect(at80.design.supported_heat_kw).toBeCloseTo(10, 12);
  });

  it('calculator: the what-if lists the vehicles that would have derated, as the CLI replay does', async () => {
    const res = await calculate({ design: DESIGN, what_if: WHAT_IF });
    expect(res.status).toBe(200);
    const body = (await res.json()) as CalculatorResponse;
    expect(body.what_if!.fleet).toEqual(cliWhatIf.fleet.what_if![1]);
    expect(body.what_if!.vehicles.map((v) => v.id).sort()).toEqual([...IDS].sort());
    for (const v of body.what_if!.vehicles) {
      const { id, ...w } = v;
      expect(w).toEqual(cliWhatIf.vehicles.find((x) => x.id === id)!.what_if![1]);
    }
    // A default scenario is answered from the figures themselves.
    const hot = (await (
      await calculate({ design: DESIGN, what_if: { ambient_rise_k: 5, limit_drop_k: 0 } })
    ).json()) as CalculatorResponse;
    expect(hot.what_if!.fleet).toEqual(cli.fleet.what_if![1]);
    expect(hot.what_if!.fleet.vehicles_derated.map((v) => v.id)).toEqual(
      hot.what_if!.vehicles.filter((v) => v.hours > 0).map((v) => v.id),
    );
  });

  it('refuses bad input with 400, naming each field and rule', async () => {
    const problems = async (body: unknown) => {
      const res = await calculate(body);
      expect(res.status).toBe(400);
      return ((await res.json()) as { error: { problems: { where: string; rule: string }[] } }).error
        .problems;
    };
    expect(await problems({ design: { ...DESIGN, ambient_c: 'hot' } })).toContainEqual({
      where: 'body: design.ambient_c',
      rule: 'ambient_c must be a number',
    });
    expect((await problems({ design: { ...DESIGN, coolant_limit_c: 35 } }))[0]!.where).toBe(
      'body: design.coolant_limit_c',
    );
    expect((await problems({ design: { ...DESIGN, area_m2: -1 } }))[0]).toEqual({
      where: 'body: design.area_m2',
      rule: 'must be > 0',
    });
    expect((await problems({ design: DESIGN, duty: { mass: 3 } }))[0]!.where).toMatch(/^body: duty/);
    expect((await problems({ design: { heat_kw: 20 } })).map((p) => p.where)).toEqual(
      expect.arrayContaining(['body: design.ambient_c', 'body: design.coolant_limit_c']),
    );
    const cold = await problems({ design: DESIGN, what_if: { ambient_rise_k: 0, limit_drop_k: 35 } });
    expect(cold[0]!.where).toBe('body: what_if.limit_drop_k');
    expect(cold[0]!.rule).toMatch(/at or below its thermostat opening/);
    expect((await problems({ design: DESIGN, duty: { grade_pct: -15, speed_kmh: 30 } }))[0]!.where).toBe(
      'body: duty',
    );
  });

  it('needs a token (401 without), any role may read and calculate', async () => {
    for (const path of ['/api/sizing', '/api/me']) expect((await stack.get(path, null)).status).toBe(401);
    const anon = await fetch(`${stack.url}/api/sizing/calculator`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ design: DESIGN }),
    });
    expect(anon.status).toBe(401);
    expect((await stack.get('/api/sizing', 'viewer')).status).toBe(200);
    expect((await calculate({ design: DESIGN }, 'admin')).status).toBe(200);
  });

  it('GET /api/me names the token and its role', async () => {
    for (const role of ['viewer', 'engineer', 'admin'] as const) {
      const res = await stack.get('/api/me', role);
      expect(res.status).toBe(200);
      expect(meResponseSchema.parse(await res.json())).toEqual({ name: `${role}-user`, role });
    }
    const bad = await fetch(`${stack.url}/api/me`, { headers: { authorization: 'Bearer not-a-token-0000' } });
    expect(bad.status).toBe(401);
  });

  it('the OpenAPI document describes the sizing routes and /api/me', async () => {
    const doc = (await (await stack.get('/api/openapi.json', null)).json()) as {
      paths: Record<string, Record<string, { 'x-role'?: string; requestBody?: unknown }>>;
    };
    expect(doc.paths['/api/sizing']!.get!['x-role']).toBe('viewer');
    const calc = doc.paths['/api/sizing/calculator']!.post!;
    expect(calc['x-role']).toBe('viewer');
    expect(JSON.stringify(calc.requestBody)).toContain('coolant_limit_c');
    expect(doc.paths['/api/me']!.get!['x-role']).toBe('viewer');
  });
  // Last: the CLI runs with spawnSync, which stalls this process (and the API in it) meanwhile.
  it('`thermargin sizing --from-store` writes the same figures', () => {
    const out = join(dir, 'from-store.json');
    const r = runCli(['sizing', '--from-store', '--out', out]);
    expect(r.code).toBe(2); // no FLEET_FILE, no --fleet: refused, saying which
    expect(r.stderr).toMatch(/FLEET_FILE is required/);
    const env = {
      STORE_KIND: 'sqlite',
      STORE_SQLITE_PATH: join(dir, 'samples.db'),
      RESULTS_SQLITE_PATH: join(dir, 'results.db'),
    };
    const ok = runCli(['sizing', '--from-store', '--fleet', stack.fleetFile, '--out', out], env);
    expect(ok.code, ok.stderr).toBe(0);
    expect(ok.stderr).toMatch(/sized 3 vehicles from the stores, \d+ trips/);
    expect(figuresOf(out)).toStrictEqual(cli);
  });
});
