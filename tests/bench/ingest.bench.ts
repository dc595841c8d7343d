/**
 * `npm run bench:ingest`: end-to-end ingestion (published → stored and queryable) per adapter, in the
 * same run as the raw ceilings it sits on: the broker alone (publisher → subscriber, same payloads) and
 * each store alone (bulk writes of the same points). Prints figures and ratios; asserts nothing.
 * The publisher runs as a child process (this file with `publish`), as vehicles would.
 */
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { createIngester } from '@thermargin/ingester/ingester';
import { ENV, readIngesterConfig } from '@thermargin/ingester/config';
import { type WireSample, encodeSamplePayload, sampleTopic, toSample } from '@thermargin/shared';
import { type SampleStore, createInfluxStore, createSqliteStore } from '@thermargin/store';
import mqtt from 'mqtt';
import { startInflux } from '../support/servers/influx.ts';
import { startMosquitto } from '../support/servers/mosquitto.ts';
import {
  INGESTER_USER,
  fleetStream,
  ingesterEnv,
  tempDir,
  vehicleUser,
  writeFleetFile,
} from '../services/ingester/support.ts';

const IDS = Array.from({ length: 8 }, (_, i) => `bench-${String(i).padStart(2, '0')}`);
const PER_VEHICLE = 25_000;
const BATCH = Number(process.env.BENCH_BATCH ?? 250); // samples per message
const TOTAL = IDS.length * PER_VEHICLE;

if (process.argv[2] === 'publish') {
  await publish(process.argv[3]!);
  process.exit(0);
}

/**
 * Publisher child: payloads encoded and vehicles connected first, then "ready"; on "go" (stdin) every
 * vehicle publishes its stream at QoS 1 with a window of messages in flight.
 */
async function publish(url: string): Promise<void> {
  const vehicles = await Promise.all(
    fleetStream(IDS, PER_VEHICLE).map(async (samples) => {
      const u = vehicleUser(samples[0]!.vehicle);
      const payloads: string[] = [];
      for (let i = 0; i < samples.length; i += BATCH)
        payloads.push(encodeSamplePayload(samples.slice(i, i + BATCH)));
      const c = await mqtt.connectAsync(url, {
        username: u.username,
        password: u.password,
        protocolVersion: 5,
      });
      return { c, topic: sampleTopic(u.username), payloads };
    }),
  );
  process.stdout.write('ready\n');
  await new Promise((r) => process.stdin.once('data', r));
  await Promise.all(
    vehicles.map(async ({ c, topic, payloads }) => {
      const window: Promise<unknown>[] = [];
      for (const p of payloads) {
        window.push(c.publishAsync(topic, p, { qos: 1 }));
        if (window.length >= 32) await window.shift();
      }
      await Promise.all(window);
      await c.endAsync();
    }),
  );
}

/** Starts the publisher child; resolves with `go`, which starts publishing and resolves when all is acknowledged. */
async function preparePublisher(url: string): Promise<() => Promise<void>> {
  const child = spawn(process.execPath, ['--import', 'tsx', import.meta.filename, 'publish', url], {
    stdio: ['pipe', 'pipe', 'inherit'],
  });
  const exited = new Promise<void>((resolve, reject) =>
    child.once('exit', (code) =>
      code === 0 ? resolve() : reject(new Error(`publisher exited with ${code}`)),
    ),
  );
  await new Promise((r) => child.stdout!.once('data', r));
  return () => {
    child.stdin!.write('go\n');
    return exited;
  };
}

const rate = (n: number, ms: number) => Math.round((n / ms) * 1000);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function brokerCeiling(url: string): Promise<number> {
  const sub = await mqtt.connectAsync(url, {
    username: INGESTER_USER.username,
    password: INGESTER_USER.password,
    protocolVersion: 5,
  });
  let samples = 0;
  let done: () => void = () => {};
  const all = new Promise<void>((r) => (done = r));
  sub.on('message', (_t, payload) => {
    samples += countSamples(payload);
    if (samples >= TOTAL) done();
  });
  await sub.subscribeAsync('thermargin/v1/vehicles/+/samples', { qos: 1 });
  const go = await preparePublisher(url);
  const t0 = performance.now();
  await Promise.all([go(), all]);
  const ms = performance.now() - t0;
  await sub.endAsync();
  return rate(TOTAL, ms);
}

/** Counts samples in a batch payload without decoding it (the subscriber must not be the bottleneck). */
function countSamples(payload: Buffer): number {
  let n = 0;
  for (let i = payload.indexOf('"time"'); i !== -1; i = payload.indexOf('"time"', i + 6)) n++;
  return n;
}

async function storeCeiling(store: SampleStore): Promise<number> {
  const points = fleetStream(IDS, PER_VEHICLE)
    .flat()
    .map((w: WireSample) => toSample(w));
  const t0 = performance.now();
  for (let i = 0; i < points.length; i += 5000) await store.writeSamples(points.slice(i, i + 5000));
  return rate(points.length, performance.now() - t0);
}

async function endToEnd(url: string, store: SampleStore, name: string, dir: string) {
  const config = readIngesterConfig({
    ...ingesterEnv({
      mqtt_url: url,
      fleet_file: writeFleetFile(dir, IDS),
      client_id: `bench-${name}`,
      spool_dir: join(dir, `spool-${name}`),
      store: {},
    }),
    [ENV.SHARE_GROUP]: `bench-${name}`,
    [ENV.CONNECTIONS]: process.env.BENCH_CONNECTIONS ?? '16',
  });
  const ingester = createIngester({ ...config, metrics_port: -1 }, { store, known_vehicles: new Set(IDS) });
  await ingester.start();
  let peakRss = 0;
  const sampler = setInterval(() => (peakRss = Math.max(peakRss, process.memoryUsage().rss)), 100);
  const go = await preparePublisher(url);
  const t0 = performance.now();
  await go();
  for (;;) {
    const spans = await store.listVehicles();
    if (spans.reduce((a, s) => a + s.count, 0) >= TOTAL) break;
    await sleep(50);
  }
  const ms = performance.now() - t0;
  clearInterval(sampler);
  await ingester.stop();
  return { rate: rate(TOTAL, ms), peak_rss_mb: Math.round(peakRss / 2 ** 20) };
}

const dir = tempDir('bench');
const broker = await startMosquitto([INGESTER_USER, ...IDS.map(vehicleUser)]);
const influx = await startInflux();
for (const db of ['raw', 'e2e']) await influx.createDatabase(db);
const influxStore = (database: string) => createInfluxStore({ url: influx.url, api: 'v1', database });
console.log(
  `${TOTAL} samples, ${IDS.length} vehicles, ${BATCH} samples per message, QoS 1, Mosquitto ${broker.url}`,
);

const brokerRate = await brokerCeiling(broker.url);
const sqliteRaw = await storeCeiling(createSqliteStore({ path: join(dir, 'raw.db') }));
const influxRaw = await storeCeiling(influxStore('raw'));
const sqliteE2e = await endToEnd(broker.url, createSqliteStore({ path: join(dir, 'e2e.db') }), 'sqlite', dir);
const influxE2e = await endToEnd(broker.url, influxStore('e2e'), 'influx', dir);

const row = (what: string, r: number, ceiling?: number, extra = '') =>
  `| ${what.padEnd(44)} | ${String(r).padStart(9)} | ${ceiling ? `${Math.round((r / ceiling) * 100)} %`.padStart(18) : ''.padStart(18)} | ${extra}`;
console.log('\n| path | samples/s | of slower ceiling | notes');
console.log('|---|---:|---:|---');
console.log(row('broker alone (Mosquitto, publisher → subscriber)', brokerRate));
console.log(row('SQLite alone (5 000-sample transactions, FULL)', sqliteRaw));
console.log(row('InfluxDB 1.6 alone (5 000-line writes)', influxRaw));
console.log(
  row(
    'end-to-end → SQLite',
    sqliteE2e.rate,
    Math.min(brokerRate, sqliteRaw),
    `peak RSS ${sqliteE2e.peak_rss_mb} MB`,
  ),
);
console.log(
  row(
    'end-to-end → InfluxDB',
    influxE2e.rate,
    Math.min(brokerRate, influxRaw),
    `peak RSS ${influxE2e.peak_rss_mb} MB`,
  ),
);

await broker.close();
await influx.close();
process.exit(0);
