/**
 * Hostile-input probe (slow; the suite tests each rule on its own): against a running `npm start`
 * (embedded broker, SQLite, no demo fleet) it sends HTTP requests of every hostile shape, a wrong-token
 * client for `PROBE_HAMMER_S` seconds (default 10), the ingester tests' hostile MQTT corpus mixed with
 * counted valid messages, takeover attempts on the ingester's client id, and runs `thermargin analyze`
 * on hostile CSV files; it prints each kind with its count and answers, and the figures.
 *   node --import tsx tests/probe/hostile.ts
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { encodeSamplePayload, sampleTopic } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import mqtt from 'mqtt';
import { hostileCorpus } from '../services/ingester/corpus.ts';
import { fleetStream } from '../services/ingester/support.ts';
import { runStack } from '../services/stack/run-stack.ts';
import { freePort } from '../support/servers/free-port.ts';

const HAMMER_S = Number(process.env.PROBE_HAMMER_S ?? 10);
const tally = new Map<string, Map<string, number>>();
const count = (kind: string, answer: string | number) => {
  const t = tally.get(kind) ?? new Map<string, number>();
  t.set(String(answer), (t.get(String(answer)) ?? 0) + 1);
  tally.set(kind, t);
};

const data = mkdtempSync(join(tmpdir(), 'thermargin-probe-'));
const brokerPort = await freePort();
// The probe's own shapes get their answers, not the rate limit's (the back-off is measured apart).
const stack = await runStack(
  {
    THERMARGIN_SIMULATE: '0',
    THERMARGIN_DEMO_VEHICLES: '2',
    THERMARGIN_DEMO_DAYS: '1',
    THERMARGIN_BROKER_PORT: String(brokerPort),
    API_RATE_LIMIT_PER_MIN: '1000000',
    API_RATE_LIMIT_BURST: '100000',
  },
  data,
);
const state = JSON.parse(readFileSync(join(data, 'demo-state.json'), 'utf8')) as {
  vehicle_passwords: Record<string, string>;
};
const [v1, v2] = Object.keys(state.vehicle_passwords).sort() as [string, string];
const auth = { authorization: `Bearer ${stack.token}` };
const json = { ...auth, 'content-type': 'application/json' };
const ask = async (kind: string, path: string, init: RequestInit = {}) => {
  const r = await fetch(`${stack.url}${path}`, { ...init, headers: { ...auth, ...init.headers } });
  const body = await r.text();
  // A path outside the API that names no file gets the dashboard page (its router says "not found").
  count(kind, r.status === 200 && body.startsWith('<!doctype html') ? '200 the dashboard page' : r.status);
};

// ---- HTTP shapes (a valid token, so each is judged on its shape)
for (let i = 0; i < 40; i++) {
  for (const p of ['/../../etc/passwd', '/%2e%2e/%2e%2e/etc/passwd', `/api/vehicles/..%2f..%2fetc%2fpasswd`])
    await ask('path traversal', p);
  for (const id of ["x' OR '1'='1", '"; DROP TABLE trip_results; --', 'a b', '..', 'v'.repeat(65)])
    await ask('injection-shaped id', `/api/vehicles/${encodeURIComponent(id)}/trips`);
  await ask('oversize body', `/api/vehicles/${v1}/maintenance`, {
    method: 'POST',
    headers: json,
    body: JSON.stringify({ date: '2026-07-30', action: 'fan_repaired', note: 'x'.repeat(200_000 + i) }),
  });
  await ask('deeply nested body', '/api/fleet', {
    method: 'PUT',
    headers: json,
    body: `{"vehicles":${'['.repeat(100_000)}${']'.repeat(100_000)}}`,
  });
  await ask('malformed JSON', `/api/vehicles/${v1}/maintenance`, {
    method: 'POST',
    headers: json,
    body: `{"date": "2026-07-30", ${i}`,
  });
  await ask('not JSON (content type)', `/api/vehicles/${v1}/maintenance`, {
    method: 'POST',
    headers: { 'content-type': 'text/plain' },
    body: 'date=2026-07-30',
  });
  await ask('unknown or wrongly typed fields', `/api/vehicles/${v1}/maintenance`, {
    method: 'POST',
    headers: json,
    body: JSON.stringify({ date: 20260730 + i, action: 'polished', by: 'someone else' }),
  });
  for (const n of ['0x10', '1e3', '-1', '99999999999999999999', ' 5'])
    await ask(
      'number not in decimal digits or out of range',
      `/api/vehicles/${v1}/trips?limit=${encodeURIComponent(n)}`,
    );
  await ask('missing asset', `/assets/missing-${i}.js`);
  await ask('malformed letters filter', `/api/rejected/letters?vehicle=${encodeURIComponent(`a'b${i}`)}`);
  await ask('no token on a write', '/api/fleet/reload', { method: 'POST', headers: { authorization: '' } });
}

// ---- MQTT: the hostile corpus of the fleet's own vehicles, each followed by a counted valid message
const url = `mqtt://127.0.0.1:${brokerPort}`;
const login = (vehicle: string, clientId = vehicle) =>
  mqtt.connectAsync(url, {
    username: vehicle,
    password: state.vehicle_passwords[vehicle]!,
    clientId,
    protocolVersion: 4,
    reconnectPeriod: 0,
  });
const pubs = new Map([
  [v1, await login(v1)],
  [v2, await login(v2)],
]);
const corpus = hostileCorpus(v1, v2, 'no-such-vehicle').filter((b) => pubs.has(b.publisher));
const valid = fleetStream([v2], corpus.length)[0]!;
for (const [i, bad] of corpus.entries()) {
  await pubs.get(bad.publisher)!.publishAsync(sampleTopic(bad.topic_vehicle), bad.payload, { qos: 1 });
  await pubs.get(v2)!.publishAsync(sampleTopic(v2), encodeSamplePayload([valid[i]!]), { qos: 1 });
}
const tenThousand: unknown[] = Array.from({ length: 10_000 }, () => 0);
await pubs.get(v1)!.publishAsync(sampleTopic(v1), JSON.stringify(tenThousand), { qos: 1 });
// Another vehicle's topic: refused, the connection dropped (MQTT 3.1.1 has no PUBACK code for it).
for (let i = 0; i < 20; i++) {
  const c = await login(v1, `acl-${i}`);
  c.publish(sampleTopic(v2), encodeSamplePayload([valid[0]!]), { qos: 1 });
  const closed = await Promise.race([
    new Promise<boolean>((r) => c.once('close', () => r(true))),
    new Promise<boolean>((r) => setTimeout(() => r(false), 2000)),
  ]);
  count("publish to another vehicle's topic", closed ? 'connection closed, not stored' : 'still open');
  c.end(true);
}
// The ingester's client id with a vehicle's login: the broker gives the vehicle its own id instead.
for (let i = 0; i < 20; i++) {
  const c = await login(v2, 'thermargin-ingester');
  count("vehicle login with the ingester's client id", 'connected as itself');
  await c.endAsync(true);
}
for (const c of pubs.values()) await c.endAsync();
await new Promise((r) => setTimeout(r, 1000));

// ---- The wrong-token client, last: its back-off holds this address for a while
const t0 = performance.now();
let sent = 0;
const answers = new Map<number, number>();
while (performance.now() - t0 < HAMMER_S * 1000) {
  const r = await fetch(`${stack.url}/api/fleet`, {
    headers: { authorization: `Bearer wrong-token-${sent}` },
  });
  await r.arrayBuffer();
  sent++;
  answers.set(r.status, (answers.get(r.status) ?? 0) + 1);
}
const hammer_s = (performance.now() - t0) / 1000;

const code = await stack.stop();
const store = createSqliteStore({ path: join(data, 'samples.db') });
const letters = await store.countDeadLetters();
const stored = (await store.readSamples(v2, 0, 8.64e15)).n;
await store.close();

// ---- CSV files through `thermargin analyze`
const dir = mkdtempSync(join(tmpdir(), 'thermargin-probe-csv-'));
const fleet = join(data, 'fleet.json');
const HEADER = 'time,vehicle,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct';
const row = (i: number) =>
  `${new Date(Date.UTC(2026, 6, 1, 8) + i * 1000).toISOString()},${v1},85,60,80,35,0`;
const files: [string, string, (f: string) => void][] = [
  ['a valid file (baseline)', 'valid.csv', (f) => writeFileSync(f, `${HEADER}\n${row(0)}\n${row(1)}\n`)],
  [
    '1 GB line without a line break',
    'no-break.csv',
    (f) => {
      writeFileSync(f, 'time');
      truncateSync(f, 2 ** 30);
    },
  ],
  [
    'valid header, then a 1 GB row',
    'long-row.csv',
    (f) => {
      writeFileSync(f, `${HEADER}\n${row(0)}\n`);
      truncateSync(f, 2 ** 30);
    },
  ],
  ['a column named twice', 'twice.csv', (f) => writeFileSync(f, `${HEADER},speed_kmh\n${row(0)},1\n`)],
  [
    '0x10 as a value',
    'hex.csv',
    (f) => writeFileSync(f, `${HEADER}\n${row(0).replace(',85,', ',0x10,')}\n${row(1)}\n`),
  ],
];
const csv: string[] = [];
for (const [what, name, make] of files) {
  const file = join(dir, name);
  make(file);
  const script = `const { main } = await import(${JSON.stringify(join(import.meta.dirname, '../../services/cli/src/main.ts'))});
const code = await main(${JSON.stringify(['analyze', '--fleet', fleet, '--data', file, '--out', '/dev/null'])});
process.stderr.write('\\nusage=' + process.resourceUsage().maxRSS + '\\n'); process.exitCode = code;`;
  const t = performance.now();
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], {
    encoding: 'utf8',
  });
  const rss = Number(/usage=(\d+)/.exec(r.stderr)?.[1] ?? 0) / 1024;
  const said = r.stderr.split('\n').find((l) => /thermargin analyze|row skipped/.test(l)) ?? '';
  csv.push(
    `  ${what}: exit ${r.status}, peak RSS ${rss.toFixed(0)} MB, ${((performance.now() - t) / 1000).toFixed(1)} s; ${said.trim().slice(0, 150)}`,
  );
}

console.log(`\nHTTP (one answer per request; a valid token unless said):`);
for (const [kind, t] of tally) console.log(`  ${kind}: ${[...t].map(([a, n]) => `${n}× ${a}`).join(', ')}`);
const byReason = Object.fromEntries(letters.map((l) => [`${l.vehicle}/${l.reason}`, l.count]));
console.log(
  `\nMQTT: ${corpus.length} hostile messages + one of 10 000 bad items → dead letters ${JSON.stringify(byReason)}; ` +
    `${valid.length} valid samples sent between them, ${stored} stored`,
);
console.log(
  `\nwrong-token client, ${hammer_s.toFixed(1)} s: ${sent} requests answered (${(sent / hammer_s).toFixed(0)}/s); ` +
    `${[...answers].map(([s, n]) => `${n}× ${s}`).join(', ')}; token lookups ${((answers.get(401) ?? 0) / hammer_s).toFixed(2)}/s`,
);
console.log(`\nCSV through thermargin analyze:\n${csv.join('\n')}`);
console.log(`\nthe stack stopped with exit ${code}`);
process.exit(0);
