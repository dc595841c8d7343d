/**
 * `npm run bench:ingest`: end-to-end ingestion (published → stored and queryable) per adapter, in the
 * same run as the raw ceilings it sits on: the broker alone (publisher → subscriber, same payloads) and
 * each store alone (bulk writes of the same points). Then the same samples sent as SAE J1939 frames on
 * the frames topic (the demo loggers' messages, decoded by the ingester) beside the samples path.
 * Prints figures and ratios; asserts nothing. The publisher runs as a child process (this file with
 * `publish`), as vehicles would.
 */
import { spawn } from 'node:child_process';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { RECEIVE_MAXIMUM, createIngester } from '@thermargin/ingester/ingester';
import { PIPELINE_DEFAULTS } from '@thermargin/ingester/pipeline';
import { DEFAULT_CONNECTIONS, ENV, readIngesterConfig } from '@thermargin/ingester/config';
import {
  type Sample,
  encodeFrameBatch,
  encodeSamplePayload,
  frameTopic,
  sampleTopic,
  sharedSampleFilter,
  toSample,
} from '@thermargin/shared';
import { DEMO_FRAME_MAPS, sampleFrames } from '../../services/simulator/src/frames.ts';
import { type SampleStore, createInfluxStore, createSqliteStore } from '@thermargin/store';
import mqtt from 'mqtt';
import { startInflux } from '../support/servers/influx.ts';
import { type MosquittoServer, startMosquitto } from '../support/servers/mosquitto.ts';
import { machineBusy_s, processCpu_s } from './cpu-meter.ts';
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
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? DEFAULT_CONNECTIONS); // the ingester's (and the raw subscriber's)
const STORE_CHUNK = 5000; // samples per store-alone write
const TOTAL = IDS.length * PER_VEHICLE;

if (process.argv[2] === 'publish') {
  await publish(process.argv[3]!, process.argv[4] === 'frames');
  process.exit(0);
}

/** Bytes a message of the stream costs, samples and frames, for the comparison line. */
function payloadBytes(frames: boolean): number {
  const [samples] = fleetStream(IDS, BATCH);
  return frames
    ? encodeFrameBatch(samples!.flatMap((w) => sampleFrames(toSample(w), false))).length
    : encodeSamplePayload(samples!).length;
}

/**
 * Publisher child: payloads encoded and vehicles connected first, then "ready"; on "go" (stdin) every
 * vehicle publishes its stream at QoS 1 with a window of messages in flight.
 */
async function publish(url: string, frames: boolean): Promise<void> {
  const vehicles = await Promise.all(
    fleetStream(IDS, PER_VEHICLE).map(async (samples) => {
      const u = vehicleUser(samples[0]!.vehicle);
      const payloads: (string | Buffer)[] = [];
      for (let i = 0; i < samples.length; i += BATCH) {
        const part = samples.slice(i, i + BATCH);
        payloads.push(
          frames
            ? Buffer.from(encodeFrameBatch(part.flatMap((w) => sampleFrames(toSample(w), false))))
            : encodeSamplePayload(part),
        );
      }
      const c = await mqtt.connectAsync(url, {
        username: u.username,
        password: u.password,
        protocolVersion: 5,
      });
      return { c, topic: (frames ? frameTopic : sampleTopic)(u.username), payloads };
    }),
  );
  process.stdout.write('ready\n');
  await new Promise((r) => process.stdin.once('data', r));
  const cpu0 = process.cpuUsage();
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
  const cpu = process.cpuUsage(cpu0);
  process.stdout.write(`${(cpu.user + cpu.system) / 1e6}\n`);
}

/**
 * Starts the publisher child; resolves with `go`, which starts publishing and resolves when all is
 * acknowledged, with the CPU seconds the publisher used for it.
 */
async function preparePublisher(url: string, frames = false): Promise<() => Promise<number>> {
  const mode = frames ? ['frames'] : [];
  const child = spawn(process.execPath, ['--import', 'tsx', import.meta.filename, 'publish', url, ...mode], {
    stdio: ['pipe', 'pipe', 'inherit'],
  });
  let report = '';
  const exited = new Promise<number>((resolve, reject) =>
    child.once('exit', (code) =>
      code === 0 ? resolve(Number(report)) : reject(new Error(`publisher exited with ${code}`)),
    ),
  );
  await new Promise((r) => child.stdout!.once('data', r));
  child.stdout!.on('data', (d) => (report += d));
  return () => {
    child.stdin!.write('go\n');
    return exited;
  };
}

const rate = (n: number, ms: number) => Math.round((n / ms) * 1000);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/**
 * The broker's ceiling for the ingester's subscription shape: the same payloads and QoS, `CONNECTIONS`
 * sessions in one shared group with the ingester's receive maximum, each message acknowledged on arrival.
 */
async function brokerCeiling(broker: Listeners, servers: Servers, group: string): Promise<Measured> {
  let samples = 0;
  let done: () => void = () => {};
  const all = new Promise<void>((r) => (done = r));
  const subs = await Promise.all(
    Array.from({ length: CONNECTIONS }, async (_, i) => {
      const sub = await mqtt.connectAsync(broker.ingester_url, {
        clientId: `${group}-${i}`,
        username: INGESTER_USER.username,
        password: INGESTER_USER.password,
        protocolVersion: 5,
        properties: { receiveMaximum: RECEIVE_MAXIMUM },
      });
      sub.on('message', (_t, payload) => {
        samples += countSamples(payload);
        if (samples >= TOTAL) done();
      });
      await sub.subscribeAsync(sharedSampleFilter(group), { qos: 1 });
      return sub;
    }),
  );
  const go = await preparePublisher(broker.url);
  const m = await measure(servers, async () => (await Promise.all([go(), all]))[0]);
  await Promise.all(subs.map((sub) => sub.endAsync()));
  return m;
}

/** Counts samples in a batch payload without decoding it (the subscriber must not be the bottleneck). */
function countSamples(payload: Buffer): number {
  let n = 0;
  for (let i = payload.indexOf('"time"'); i !== -1; i = payload.indexOf('"time"', i + 6)) n++;
  return n;
}

/**
 * The store's ceiling: the bench's points written straight in, in the order the vehicles send them
 * (one message of each in turn: a store may favour a write of one vehicle's long run), as many writes
 * in flight as the ingester's pipeline allows, then the same query that ends an end-to-end run.
 */
async function storeCeiling(store: SampleStore, servers: Servers): Promise<Measured> {
  const streams = fleetStream(IDS, PER_VEHICLE);
  const points: Sample[] = [];
  for (let i = 0; i < PER_VEHICLE; i += BATCH)
    for (const stream of streams) for (const w of stream.slice(i, i + BATCH)) points.push(toSample(w));
  const chunks: Sample[][] = [];
  for (let i = 0; i < points.length; i += STORE_CHUNK) chunks.push(points.slice(i, i + STORE_CHUNK));
  const m = await measure(servers, async () => {
    await Promise.all(
      Array.from({ length: PIPELINE_DEFAULTS.max_concurrent_writes }, async () => {
        for (let c = chunks.shift(); c; c = chunks.shift()) await store.writeSamples(c);
      }),
    );
    await store.listVehicles();
    return 0;
  });
  await store.close();
  return m;
}

/**
 * What one measurement gives: the rate; this process's CPU (all its threads) and its main thread's
 * busy time (event-loop utilisation: the thread that speaks MQTT and writes the store); the CPU of the
 * publisher child and of the servers on the path; and the whole machine's busy CPU, all over the span.
 * On 2 cores, a path whose machine is ≈ 2 cores busy is bound by the CPU that all its parts need.
 */
interface Measured {
  rate: number;
  cpu_s: number;
  main_busy_s: number;
  publisher_cpu_s: number;
  server_cpu_s: number;
  machine_busy_s: number;
  wall_s: number;
  peak_rss_mb?: number;
}

/** The broker's two listeners: vehicles publish on `url`, the ingesters read on `ingester_url`. */
type Listeners = Pick<MosquittoServer, 'url' | 'ingester_url'>;

/** Process ids of the servers a path runs through (their CPU is counted). */
type Servers = readonly (number | undefined)[];

/** Times `run`, which resolves with the publisher's CPU seconds (0 without a publisher). */
async function measure(servers: Servers, run: () => Promise<number>): Promise<Measured> {
  const serverCpu = () => servers.reduce((a: number, pid) => a + processCpu_s(pid), 0);
  const server0 = serverCpu();
  const machine0 = machineBusy_s();
  const cpu0 = process.cpuUsage();
  const elu0 = performance.eventLoopUtilization();
  const t0 = performance.now();
  const publisher_cpu_s = await run();
  const ms = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  const elu = performance.eventLoopUtilization(elu0);
  return {
    rate: rate(TOTAL, ms),
    cpu_s: (cpu.user + cpu.system) / 1e6,
    main_busy_s: elu.active / 1000,
    publisher_cpu_s,
    server_cpu_s: serverCpu() - server0,
    machine_busy_s: machineBusy_s() - machine0,
    wall_s: ms / 1000,
  };
}

async function endToEnd(
  broker: Listeners,
  store: SampleStore,
  servers: Servers,
  name: string,
  frames = false,
): Promise<Measured> {
  const config = readIngesterConfig({
    ...ingesterEnv({
      mqtt_url: broker.ingester_url,
      fleet_file: writeFleetFile(dir, IDS),
      client_id: `bench-${name}`,
      spool_dir: join(dir, `spool-${name}`),
      store: {},
    }),
    [ENV.SHARE_GROUP]: `bench-${name}`,
    [ENV.CONNECTIONS]: String(CONNECTIONS),
    ...(process.env[ENV.DECODE_WORKERS] ? { [ENV.DECODE_WORKERS]: process.env[ENV.DECODE_WORKERS] } : {}),
    // An offline session of an earlier run would keep its share of the stream queued on the broker.
    [ENV.SESSION_EXPIRY_S]: '1',
  });
  // Frames: the demo loggers' electric mapping (traction power and the rest in its proprietary PGN).
  const vehicle_maps = new Map(
    IDS.map((id) => [id, { map: DEMO_FRAME_MAPS.electric, reference_torque_nm: null }]),
  );
  const ingester = createIngester(
    { ...config, metrics_port: -1 },
    { store, known_vehicles: new Set(IDS), ...(frames ? { vehicle_maps } : {}) },
  );
  await ingester.start();
  let peakRss = 0;
  const sampler = setInterval(() => (peakRss = Math.max(peakRss, process.memoryUsage().rss)), 100);
  const go = await preparePublisher(broker.url, frames);
  let stored = 0;
  const m = await measure(servers, async () => {
    const publisher = await go();
    // The ingester's own counter says when the last write returned; one store query then proves the
    // samples queryable (polling the store meanwhile would load it and slow what is measured).
    while (ingester.metrics.samples_stored < TOTAL) await sleep(5);
    stored = (await store.listVehicles()).reduce((a, s) => a + s.count, 0);
    return publisher;
  });
  clearInterval(sampler);
  await ingester.stop();
  await store.close();
  if (stored !== TOTAL) throw new Error(`${name}: ${stored} samples queryable, expected ${TOTAL}`);
  return { ...m, peak_rss_mb: Math.round(peakRss / 2 ** 20) };
}

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
const dir = tempDir('bench');
const broker = await startMosquitto([INGESTER_USER, ...IDS.map(vehicleUser)]);
const influx = await startInflux();
const mosquittoOnly: Servers = [broker.process.pid];
const influxOnly: Servers = [influx.process.pid];
const both: Servers = [broker.process.pid, influx.process.pid];
const influxStore = async (database: string) => {
  await influx.createDatabase(database);
  return createInfluxStore({ url: influx.url, api: 'v1', database });
};
console.log(
  `${TOTAL} samples, ${IDS.length} vehicles, ${BATCH} samples per message, QoS 1, Mosquitto ${broker.url}; ` +
    `${CONNECTIONS} ingester connections; best of ${ROUNDS} rounds (fresh stores each round)`,
);

const PATHS = ['broker', 'sqlite_raw', 'influx_raw', 'sqlite_e2e', 'influx_e2e', 'sqlite_frames'] as const;
const rounds: Record<(typeof PATHS)[number], Measured>[] = [];
for (let r = 0; r < ROUNDS; r++) {
  const broker_ = await brokerCeiling(broker, mosquittoOnly, `bench-raw-${r}`);
  const sqlite_raw = await storeCeiling(createSqliteStore({ path: join(dir, `raw-${r}.db`) }), []);
  const influx_raw = await storeCeiling(await influxStore(`raw_${r}`), influxOnly);
  const sqlite_e2e = await endToEnd(
    broker,
    createSqliteStore({ path: join(dir, `e2e-${r}.db`) }),
    mosquittoOnly,
    `sqlite-${r}`,
  );
  const influx_e2e = await endToEnd(broker, await influxStore(`e2e_${r}`), both, `influx-${r}`);
  const sqlite_frames = await endToEnd(
    broker,
    createSqliteStore({ path: join(dir, `frames-${r}.db`) }),
    mosquittoOnly,
    `frames-${r}`,
    true,
  );
  rounds.push({ broker: broker_, sqlite_raw, influx_raw, sqlite_e2e, influx_e2e, sqlite_frames });
  const pct = (e2e: number, ceilings: number[]) => `${Math.round((e2e / Math.min(...ceilings)) * 100)} %`;
  console.log(
    `round ${r + 1}: e2e SQLite ${sqlite_e2e.rate} (${pct(sqlite_e2e.rate, [broker_.rate, sqlite_raw.rate])}), ` +
      `e2e InfluxDB ${influx_e2e.rate} (${pct(influx_e2e.rate, [broker_.rate, influx_raw.rate])}), ` +
      `frames → SQLite ${sqlite_frames.rate} (${Math.round((sqlite_frames.rate / sqlite_e2e.rate) * 100)} % of samples → SQLite)`,
  );
}
const best = Object.fromEntries(
  PATHS.map((p) => [p, rounds.map((r) => r[p]).reduce((a, b) => (b.rate > a.rate ? b : a))]),
) as Record<(typeof PATHS)[number], Measured>;

const perSample = (s: number) => ((s / TOTAL) * 1e6).toFixed(1).padStart(6);
const row = (what: string, m: Measured, ceiling?: number) =>
  `| ${what.padEnd(52)} | ${String(m.rate).padStart(9)} | ${ceiling ? `${Math.round((m.rate / ceiling) * 100)} %`.padStart(6) : ''.padStart(6)} | ` +
  `${perSample(m.cpu_s)} | ${perSample(m.main_busy_s)} | ${perSample(m.publisher_cpu_s)} | ${perSample(m.server_cpu_s)} | ` +
  `${perSample(m.cpu_s + m.publisher_cpu_s + m.server_cpu_s)} | ${(m.machine_busy_s / m.wall_s).toFixed(2).padStart(5)} | ` +
  `${m.peak_rss_mb ? `peak RSS ${m.peak_rss_mb} MB` : ''}`;
console.log(
  `\nµs CPU per sample: this process (ingester, subscriber or store writer; its main thread apart), the publisher, the servers on the path (Mosquitto, InfluxDB), all of these; machine: cores busy of ${availableParallelism()}`,
);
console.log(
  '| path (best round) | samples/s | of slower ceiling | this process | main thread | publisher | servers | all | machine | notes',
);
console.log('|---|---:|---:|---:|---:|---:|---:|---:|---:|---');
const lanes = PIPELINE_DEFAULTS.max_concurrent_writes;
console.log(row(`broker alone (Mosquitto, ${CONNECTIONS} shared subscribers)`, best.broker));
console.log(row(`SQLite alone (${STORE_CHUNK}-sample transactions, FULL)`, best.sqlite_raw));
console.log(row(`InfluxDB 1.6 alone (${STORE_CHUNK}-line writes, ${lanes} in flight)`, best.influx_raw));
console.log(row('end-to-end → SQLite', best.sqlite_e2e, Math.min(best.broker.rate, best.sqlite_raw.rate)));
console.log(row('end-to-end → InfluxDB', best.influx_e2e, Math.min(best.broker.rate, best.influx_raw.rate)));
console.log(
  row('frames end-to-end → SQLite (of samples → SQLite)', best.sqlite_frames, best.sqlite_e2e.rate),
);
console.log(
  `\na message of ${BATCH} samples: ${payloadBytes(false)} bytes as JSON, ${payloadBytes(true)} as J1939 frames ` +
    `(${(payloadBytes(true) / BATCH / 6).toFixed(1)} bytes a frame, 6 frames a sample)`,
);

await broker.close();
await influx.close();
process.exit(0);
