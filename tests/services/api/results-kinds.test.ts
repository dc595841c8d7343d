import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type RunningApi, startApi } from '@thermargin/api/start';
import { createScenario } from '@thermargin/simulator';
import { openResults } from '@thermargin/store/results-backend';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../support/run-cli.ts';
import { type PostgresServer, startPostgres } from '../../support/servers/postgres.ts';
import { writeScenarioFiles } from '../../support/write-samples.ts';
import { TOKENS } from './stack.ts';

/**
 * One sample store, two results databases: the API (with its analyzer), `thermargin reanalyze` and
 * `thermargin sizing --from-store` on SQLite and on a real PostgreSQL give the same answers.
 */
const scenario = createScenario({ vehicles: 3, days: 10, seed: 5 });
const ids = scenario.fleet.vehicles.map((v) => v.id);
const dir = mkdtempSync(join(tmpdir(), 'thermargin-results-kinds-'));
const now_ms = scenario.history.to_ms + 3_600_000;
let server: PostgresServer;
const env: Record<'sqlite' | 'postgres', Record<string, string>> = { sqlite: {}, postgres: {} };
const apis: Partial<Record<'sqlite' | 'postgres', RunningApi>> = {};

beforeAll(async () => {
  const { samples_path, fleet_file } = await writeScenarioFiles(dir, scenario);
  server = await startPostgres();
  const common = { STORE_KIND: 'sqlite', STORE_SQLITE_PATH: samples_path, FLEET_FILE: fleet_file };
  env.sqlite = { ...common, RESULTS_KIND: 'sqlite', RESULTS_SQLITE_PATH: join(dir, 'results.db') };
  env.postgres = {
    ...common,
    RESULTS_KIND: 'postgres',
    RESULTS_POSTGRES_URL: await server.createDatabase('kinds'),
  };
  for (const kind of ['sqlite', 'postgres'] as const) {
    const api = await startApi({
      port: 0,
      clock: () => now_ms,
      log: () => {},
      env: {
        ...env[kind],
        API_TOKENS: `viewer-user:viewer:${TOKENS.viewer},engineer-user:engineer:${TOKENS.engineer}`,
        API_RUN_ANALYZER: '1',
        ANALYZER_POLL_MS: '3600000',
      },
    });
    apis[kind] = api;
    await api.analyzer!.runOnce();
  }
}, 300_000);

afterAll(async () => {
  for (const api of Object.values(apis)) await api?.close();
  await server?.close();
});

const get = async (kind: 'sqlite' | 'postgres', path: string, role: keyof typeof TOKENS = 'viewer') => {
  const r = await fetch(`${apis[kind]!.url}${path}`, {
    headers: { authorization: `Bearer ${TOKENS[role]}` },
  });
  expect(r.status, path).toBe(200);
  return r.json() as Promise<Record<string, unknown>>;
};

describe('results on SQLite and on PostgreSQL', () => {
  it('the API answers the same fleet, vehicles and trips', async () => {
    const fleet = {
      sqlite: await get('sqlite', '/api/fleet'),
      postgres: await get('postgres', '/api/fleet'),
    };
    expect(fleet.postgres).toEqual(fleet.sqlite);
    expect((fleet.postgres.vehicles as unknown[]).length).toBe(3);
    for (const id of ids) {
      const path = `/api/vehicles/${id}`;
      expect(await get('postgres', path)).toEqual(await get('sqlite', path));
      const trips = `/api/vehicles/${id}/trips?limit=500`;
      expect(await get('postgres', trips)).toEqual(await get('sqlite', trips));
    }
  });

  it('writes through the API land in PostgreSQL with their audit rows', async () => {
    const id = ids[0]!;
    const r = await fetch(`${apis.postgres!.url}/api/vehicles/${id}/maintenance`, {
      method: 'POST',
      headers: { authorization: `Bearer ${TOKENS.engineer}`, 'content-type': 'application/json' },
      body: JSON.stringify({ date: new Date(now_ms).toISOString().slice(0, 10), action: 'coolant_serviced' }),
    });
    expect(r.status, await r.clone().text()).toBe(200);
    const db = await openResults({ kind: 'postgres', url: env.postgres.RESULTS_POSTGRES_URL! });
    try {
      expect((await db.workflow.maintenance(id)).map((m) => m.entry.action)).toEqual(['coolant_serviced']);
      expect((await db.workflow.readAudit(1))[0]).toMatchObject({
        action: 'maintenance.add',
        by: 'engineer-user',
      });
    } finally {
      await db.close();
    }
  });

  // Last: the CLI runs with spawnSync, which stalls this process (and the APIs in it) meanwhile.
  it('`thermargin reanalyze` and `thermargin sizing --from-store` work on either', () => {
    const out: Record<string, unknown> = {};
    for (const kind of ['sqlite', 'postgres'] as const) {
      const re = runCli(['reanalyze', '--vehicle', ids[1]!], env[kind]);
      expect(re.code, re.stderr).toBe(0);
      expect(re.stderr + re.stdout).toMatch(/reanalysed \d+ trips/);
      const file = join(dir, `sizing-${kind}.json`);
      const s = runCli(['sizing', '--from-store', '--out', file], env[kind]);
      expect(s.code, s.stderr).toBe(0);
      out[kind] = JSON.parse(readFileSync(file, 'utf8'));
    }
    expect(out.postgres).toStrictEqual(out.sqlite);
    const bad = runCli(['sizing', '--from-store', '--out', join(dir, 'x.json')], {
      ...env.postgres,
      RESULTS_POSTGRES_URL: 'mysql://nowhere',
    });
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/RESULTS_POSTGRES_URL must be a postgres:\/\/ URL/);
  });
});
