/**
 * Captures what a refactoring must leave byte-identical: `thermargin analyze` (json, csv, text) and
 * `thermargin sizing` (json + html, from files and from the stores) on two generated fleets, and the
 * API's answers to its read routes (and a few writes) over a seeded SQLite store with a fixed clock.
 *
 *   node --import tsx tests/support/output-capture.ts OUT_DIR
 *
 * Run it before and after a change into two folders, then `diff -r BEFORE AFTER`. Inputs are generated
 * in one fixed temp folder, so the paths the outputs name are the same in both runs.
 */
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startApi } from '@thermargin/api/start';
import { createScenario } from '@thermargin/simulator';
import { writeCsv } from '@thermargin/simulator/csv';
import { createSqliteStore } from '@thermargin/store';
import { runCli } from './run-cli.ts';
import { SIZING_FLEET } from './sizing-fleet/fleet.ts';
import { writeSizingFleet } from './sizing-fleet/write-fleet.ts';

const out = process.argv[2];
if (!out) throw new Error('usage: output-capture.ts OUT_DIR');
const work = join(tmpdir(), 'thermargin-output-capture');
rmSync(work, { recursive: true, force: true });
rmSync(out, { recursive: true, force: true });
mkdirSync(out, { recursive: true });

/** The wall clock's parts: the HTML report's "Made <time>" and the once-a-second progress lines. */
const steady = (text: string) =>
  text
    .replace(/Made \d{4}-\d\d-\d\dT[\d:.]+Z/g, 'Made <time>')
    .replace(/^thermargin: read \d+ of .*\n/gm, '');

function save(name: string, text: string): void {
  writeFileSync(join(out!, name), text);
}

function cli(name: string, args: string[], env: Record<string, string> = {}): void {
  const r = runCli(args, env);
  save(`${name}.stdout`, steady(r.stdout));
  save(`${name}.stderr`, `exit ${r.code}\n${steady(r.stderr)}`);
}

function cliRuns(label: string, fleet: string, data: string): void {
  for (const format of ['json', 'csv', 'text'])
    cli(`${label}-analyze-${format}`, ['analyze', '--fleet', fleet, '--data', data, '--format', format]);
  const html = join(work, `${label}-sizing.html`);
  cli(`${label}-sizing`, [
    'sizing',
    ...['--fleet', fleet, '--data', data, '--html', html],
    ...['--what-if', '0,15', '--what-if', '5,0', '--duty', 'mass_kg=16000,speed_kmh=40'],
  ]);
  save(`${label}-sizing.html`, steady(readFileSync(html, 'utf8')));
  cli(`${label}-sizing-refused`, ['sizing', '--fleet', fleet, '--data', data, '--what-if', '0,40']);
}

// 1. A simulated fleet with its demo faults, plus a file of bad rows.
const scenario = createScenario({ vehicles: 4, days: 14, seed: 3 });
const demo = join(work, 'demo');
writeCsv(demo, scenario);
const first = scenario.fleet.vehicles[0]!.id;
writeFileSync(
  join(demo, 'bad.csv'),
  [
    'time,vehicle,trip,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct',
    `2026-07-20T08:00:00Z,${first},X1,85,sixty,80,35,0`,
    '2026-07-20T08:00:01Z,nobody,X1,85,60,80,35,0',
    `yesterday,${first},X1,85,60,80,35,0`,
    `2026-07-20T08:00:03Z,${first},X1,85,60,80`,
  ].join('\n'),
);
cliRuns('demo', join(demo, 'fleet.json'), demo);

// 2. The sizing test fleet (known truth: two types, a cleaning half-way).
const sizing = join(work, 'sizing');
mkdirSync(sizing, { recursive: true });
const specs = SIZING_FLEET.map((s) => ({ ...s, days: 50, cleaned_on: [0, 25] }));
const sized = writeSizingFleet(sizing, specs);
cliRuns('sizing', sized.fleet, sized.data);

// 3. The API over a seeded SQLite store, analysed by its in-process analyzer, at a fixed clock.
const store = join(work, 'store');
mkdirSync(store, { recursive: true });
const samples = createSqliteStore({ path: join(store, 'samples.db') });
let batch = [];
for (const s of scenario.fleetSamples()) {
  batch.push(s);
  if (batch.length === 5000) {
    await samples.writeSamples(batch);
    batch = [];
  }
}
await samples.writeSamples(batch);
const NOW = scenario.history.to_ms + 3_600_000;
await samples.writeDeadLetters(
  [0, 1, 2].map((i) => ({
    received_ms: NOW - 60_000 * (i + 1),
    vehicle: i === 2 ? '' : first,
    reason: i === 0 ? 'schema' : 'json',
    detail: `rule ${i}`,
    topic: `fleet/${first}/samples`,
    excerpt: `{"bad":${i}}`,
    payload_bytes: 10 + i,
  })),
);
await samples.close();

const TOKENS = {
  viewer: 'capture-viewer-token-01',
  engineer: 'capture-engineer-token-1',
  admin: 'capture-admin-token-0001',
};
const env = {
  STORE_KIND: 'sqlite',
  STORE_SQLITE_PATH: join(store, 'samples.db'),
  RESULTS_SQLITE_PATH: join(store, 'results.db'),
  FLEET_FILE: join(demo, 'fleet.json'),
  API_TOKENS: Object.entries(TOKENS)
    .map(([role, t]) => `${role}-user:${role}:${t}`)
    .join(','),
  API_RATE_LIMIT_BURST: '100000',
  API_WEB_DIST: join(work, 'no-dist'),
  ANALYZER_POLL_MS: '3600000',
};
const logs: string[] = [];
const api = await startApi({
  env,
  port: 0,
  clock: () => NOW,
  log: (e, d) => logs.push(`${e} ${JSON.stringify(d)}`),
});
while (!api.analyzer || api.analyzer.stats.runs < 1 || api.analyzer.stats.running)
  await new Promise((r) => setTimeout(r, 100));

let n = 0;
async function call(
  method: string,
  path: string,
  role: keyof typeof TOKENS | null = 'viewer',
  body?: unknown,
): Promise<unknown> {
  const headers: Record<string, string> = role ? { authorization: `Bearer ${TOKENS[role]}` } : {};
  if (body !== undefined) headers['content-type'] = 'application/json';
  const res = await fetch(`${api.url}${path}`, {
    method,
    headers,
    ...(body === undefined ? {} : { body: JSON.stringify(body) }),
  });
  const text = await res.text();
  const name = `api-${String(++n).padStart(2, '0')}-${method}${path.replace(/[/?=&:]+/g, '_')}`;
  save(name, `${res.status} ${res.headers.get('content-type')}\n${text}`);
  return res.headers.get('content-type')?.startsWith('application/json') ? JSON.parse(text) : text;
}

const ids = scenario.fleet.vehicles.map((v) => v.id);
const alerted: { id: string; alert: string }[] = [];
await call('GET', '/api/health', null);
await call('GET', '/api/openapi.json', null);
await call('GET', '/api/me');
await call('GET', '/api/status');
await call('GET', '/api/fleet');
for (const id of ids) {
  const v = (await call('GET', `/api/vehicles/${id}`)) as {
    trips: { trip: string }[];
    alerts: { id: string }[];
  };
  if (v.alerts[0]) alerted.push({ id, alert: v.alerts[0].id });
  await call('GET', `/api/vehicles/${id}/trips?limit=5&offset=3`);
  await call('GET', `/api/vehicles/${id}/trips?status=ok&limit=500`);
  const trip = v.trips.at(-1)?.trip;
  if (trip) await call('GET', `/api/vehicles/${id}/trips/${trip}?points=300`);
}
await call('GET', '/api/vehicles/nobody');
await call('GET', '/api/vehicles/nobody/trips?limit=0');
await call('GET', '/api/rejected');
await call('GET', '/api/rejected/messages');
await call('GET', `/api/rejected/messages?vehicle=${first}&reason=json`);
await call('GET', '/api/sizing');
const design = { ambient_c: 40, heat_kw: 120, coolant_limit_c: 105 };
await call('POST', '/api/sizing/calculator', 'viewer', {
  design,
  what_if: { ambient_rise_k: 5, limit_drop_k: 0 },
});
await call('POST', '/api/sizing/calculator', 'viewer', {
  design,
  what_if: { ambient_rise_k: 0, limit_drop_k: 40 },
});
await call('GET', '/api/tokens', 'admin');
await call('GET', '/api/tokens', 'viewer');
await call('GET', '/api/fleet', null);
const target = alerted[0] ?? { id: first, alert: 'none' };
await call('POST', `/api/vehicles/${target.id}/alerts/${target.alert}/acknowledge`, 'engineer', {
  note: 'seen',
});
await call('POST', `/api/vehicles/${target.id}/alerts/${target.alert}/close`, 'engineer', { note: 'done' });
await call('POST', `/api/vehicles/${target.id}/alerts/${target.alert}/close`, 'engineer', { note: 'again' });
await call('POST', `/api/vehicles/${target.id}/maintenance`, 'engineer', {
  date: '2026-07-30',
  action: 'radiator_cleaned',
  note: 'washed',
});
await call('POST', `/api/vehicles/${target.id}/maintenance`, 'viewer', { date: '2026-07-30', action: 'x' });
await call('GET', `/api/vehicles/${target.id}`);
await call('GET', '/api/fleet');
await call('GET', '/api/audit?limit=10', 'admin');
await api.close();
save('api-logs', `${logs.join('\n')}\n`);

// 4. `sizing --from-store` over the stores the API's analyzer filled.
const fromStore = join(work, 'store-sizing.html');
cli('store-sizing', ['sizing', '--from-store', '--html', fromStore, '--what-if', '0,15'], env);
save('store-sizing.html', steady(readFileSync(fromStore, 'utf8')));
cli('store-sizing-refused', ['sizing', '--from-store', '--what-if', '0,40'], env);
process.stderr.write(`captured into ${out}\n`);
