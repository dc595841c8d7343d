import { type ChildProcess, spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BrokerUser } from '@thermargin/broker/acl';
import { ENV, readIngesterConfig } from '@thermargin/ingester/config';
import { type Ingester, createIngester } from '@thermargin/ingester/ingester';
import { type WireSample, encodeSamplePayload, sampleTopic } from '@thermargin/shared';
import { createSqliteStore, type SampleStore } from '@thermargin/store';
import mqtt, { type IClientOptions, type MqttClient } from 'mqtt';

/** Documented test credentials (never used outside tests). */
export const INGESTER_USER: BrokerUser = {
  username: 'ingester',
  password: 'test-ingester-pw',
  role: 'ingester',
};
export const vehicleUser = (id: string): BrokerUser => ({
  username: id,
  password: `test-${id}-pw`,
  role: 'vehicle',
});

/** Broker accounts for a fleet: the ingester and one per vehicle. */
export const fleetUsers = (ids: readonly string[]): BrokerUser[] => [INGESTER_USER, ...ids.map(vehicleUser)];

/** An MQTT client logged in as `user` (or as its vehicle id, or 'ingester'). */
export function connectAs(
  url: string,
  user: BrokerUser | string,
  opts: IClientOptions = {},
): Promise<MqttClient> {
  const u = typeof user !== 'string' ? user : user === 'ingester' ? INGESTER_USER : vehicleUser(user);
  return mqtt.connectAsync(url, { username: u.username, password: u.password, ...opts });
}

export const T0_MS = Date.UTC(2025, 6, 1, 6);

/** One plausible wire sample of `vehicle` at `time` (ACL probes). */
export const oneSample = (vehicle: string, time = Date.UTC(2025, 6, 1)) =>
  ({
    time,
    vehicle,
    speed_kmh: 1,
    power_kw: 1,
    coolant_in_c: 70,
    ambient_c: 20,
    fan_pct: 0,
  }) satisfies WireSample;

/** A fleet file (fleetSchema) listing these vehicles with round, plausible figures. */
export function writeFleetFile(dir: string, ids: readonly string[]): string {
  const vehicles = ids.map((id) => ({
    id,
    powertrain: 'fcev',
    drivetrain_efficiency: 0.5,
    radiator_area_m2: 1.2,
    coolant_limit_c: 85,
    thermostat_open_c: 65,
    thermal_mass_kj_per_k: 120,
    coolant_glycol_pct: 50,
    design: { ambient_c: 40, heat_kw: 150, speed_kmh: 20, fan_pct: 100 },
  }));
  const path = join(dir, 'fleet.json');
  writeFileSync(path, JSON.stringify({ vehicles }));
  return path;
}

/** Deterministic samples: vehicle v, sample i → values from (v, i), one per second from T0_MS. */
export function fleetStream(ids: readonly string[], perVehicle: number): WireSample[][] {
  return ids.map((vehicle, v) =>
    Array.from({ length: perVehicle }, (_, i) => ({
      time: T0_MS + i * 1000,
      vehicle,
      trip: `trip-${Math.floor(i / 3600)}`,
      speed_kmh: (i * 7 + v) % 120,
      power_kw: ((i * 13 + v * 5) % 400) - 50,
      coolant_in_c: 60 + ((i + v) % 30),
      ambient_c: 25 + (v % 10),
      fan_pct: (i * 3) % 101,
    })),
  );
}

/** The checksum of a stream: count and the sum of a signal that varies per sample. */
export function expectedTotals(stream: WireSample[][]): { count: number; power_sum: number } {
  let count = 0;
  let power_sum = 0;
  for (const s of stream.flat()) {
    count++;
    power_sum += s.power_kw;
  }
  return { count, power_sum };
}

export async function storedTotals(
  store: SampleStore,
  ids: readonly string[],
): Promise<{ count: number; power_sum: number }> {
  let count = 0;
  let power_sum = 0;
  for (const id of ids) {
    const c = await store.readSamples(id, 0, 8.64e15);
    count += c.n;
    for (const p of c.power_kw) power_sum += p;
  }
  return { count, power_sum };
}

/** Polls the store until `count` samples are there (or `timeout_ms`), returning the last totals. */
export async function waitForCount(
  store: SampleStore,
  ids: readonly string[],
  count: number,
  timeout_ms = 60_000,
) {
  const deadline = Date.now() + timeout_ms;
  for (;;) {
    const totals = await storedTotals(store, ids).catch(() => ({ count: -1, power_sum: 0 }));
    if (totals.count >= count || Date.now() > deadline) return totals;
    await new Promise((r) => setTimeout(r, 200));
  }
}

/**
 * Publishes each vehicle's samples in batches of `batch` at QoS 1 over its own credentials; resolves
 * when the broker has acknowledged all of them. `between` runs after each round (fault injection).
 */
export async function publishStream(
  url: string,
  stream: WireSample[][],
  batch: number,
  between?: (round: number) => Promise<void>,
  protocol: 4 | 5 = 5,
): Promise<void> {
  const clients = await Promise.all(
    stream.map((samples) => {
      const vehicle = samples[0]!.vehicle;
      return connectAs(url, vehicle, {
        clientId: `pub-${vehicle}`,
        protocolVersion: protocol,
        clean: false,
        ...(protocol === 5 ? { properties: { sessionExpiryInterval: 3600 } } : {}),
        reconnectPeriod: 200,
      });
    }),
  );
  const rounds = Math.ceil(Math.max(...stream.map((s) => s.length)) / batch);
  for (let r = 0; r < rounds; r++) {
    await Promise.all(
      stream.map((samples, v) => {
        const part = samples.slice(r * batch, (r + 1) * batch);
        if (part.length === 0) return undefined;
        return clients[v]!.publishAsync(sampleTopic(samples[0]!.vehicle), encodeSamplePayload(part), {
          qos: 1,
        });
      }),
    );
    await between?.(r);
  }
  await Promise.all(clients.map((c) => c.endAsync()));
}

/** The ingester as a child process (`main.ts`), for crash tests. */
export class IngesterProcess {
  child: ChildProcess | undefined;
  log = '';
  constructor(private readonly env: Record<string, string>) {}

  start(): Promise<void> {
    const child = spawn(process.execPath, ['--import', 'tsx', 'services/ingester/src/main.ts'], {
      env: { ...process.env, ...this.env },
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    this.child = child;
    return new Promise((resolve, reject) => {
      child.stderr!.on('data', (d: Buffer) => {
        this.log += d.toString();
        if (this.log.includes('"ingester_started"')) resolve();
      });
      child.once('exit', (code) =>
        reject(new Error(`ingester exited with ${code} before starting:\n${this.log}`)),
      );
    });
  }

  async kill(signal: NodeJS.Signals = 'SIGKILL'): Promise<number | null> {
    const child = this.child;
    if (!child || child.exitCode !== null) return child?.exitCode ?? null;
    const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
    child.kill(signal);
    return exited;
  }
}

/** The ingester's environment; `store` defaults to SQLite defaults, `share_group` to the config's. */
export function ingesterEnv(opts: {
  mqtt_url: string;
  fleet_file: string;
  client_id: string;
  spool_dir: string;
  store?: Record<string, string>;
  share_group?: string;
}): Record<string, string> {
  return {
    [ENV.MQTT_URL]: opts.mqtt_url,
    [ENV.MQTT_USERNAME]: INGESTER_USER.username,
    [ENV.MQTT_PASSWORD]: INGESTER_USER.password,
    [ENV.MQTT_CLIENT_ID]: opts.client_id,
    [ENV.FLEET_FILE]: opts.fleet_file,
    [ENV.SPOOL_DIR]: opts.spool_dir,
    [ENV.METRICS_PORT]: '0',
    [ENV.CONNECTIONS]: '4',
    ...(opts.share_group === undefined ? {} : { [ENV.SHARE_GROUP]: opts.share_group }),
    ...opts.store,
  };
}

/** The ingester in-process on `env` (metrics server off), writing to `store`, started. */
export async function startIngester(
  env: Record<string, string>,
  store: SampleStore,
  ids: readonly string[],
): Promise<Ingester> {
  const config = readIngesterConfig(env);
  const ingester = createIngester({ ...config, metrics_port: -1 }, { store, known_vehicles: new Set(ids) });
  await ingester.start();
  return ingester;
}

/**
 * The in-process ingester of the fleet `ids` on the broker at `mqtt_url`, its fleet file and spool
 * (sub-folder `spool`) in `dir`, with `env` on top; started.
 */
export function startFleetIngester(o: {
  mqtt_url: string;
  dir: string;
  ids: readonly string[];
  client_id: string;
  share_group: string;
  store: SampleStore;
  spool?: string;
  env?: Record<string, string>;
}): Promise<Ingester> {
  const env = ingesterEnv({
    mqtt_url: o.mqtt_url,
    fleet_file: writeFleetFile(o.dir, o.ids),
    client_id: o.client_id,
    spool_dir: join(o.dir, o.spool ?? 'spool'),
    share_group: o.share_group,
  });
  return startIngester({ ...env, ...o.env }, o.store, o.ids);
}

/** A temp dir removed when the test process exits. */
export function tempDir(what: string): string {
  const dir = mkdtempSync(join(tmpdir(), `thermargin-${what}-`));
  process.once('exit', () => rmSync(dir, { recursive: true, force: true }));
  return dir;
}

export interface Audit {
  expected: number;
  stored: number;
  lost: number;
  duplicates: number;
  checksum_ok: boolean;
}

/** What the store holds against the stream: samples lost, and stored more than once (same vehicle + time). */
export async function audit(store: SampleStore, stream: WireSample[][]): Promise<Audit> {
  let stored = 0;
  let distinct = 0;
  let power_sum = 0;
  for (const samples of stream) {
    const c = await store.readSamples(samples[0]!.vehicle, 0, 8.64e15);
    stored += c.n;
    for (let i = 0; i < c.n; i++) {
      if (i === 0 || c.time_ms[i] !== c.time_ms[i - 1]) {
        distinct++;
        power_sum += c.power_kw[i]!;
      }
    }
  }
  const want = expectedTotals(stream);
  return {
    expected: want.count,
    stored,
    lost: want.count - distinct,
    duplicates: stored - distinct,
    checksum_ok: Math.abs(power_sum - want.power_sum) < 1e-6,
  };
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/**
 * bus-01 publishes 400 counted samples on `vehicle_url` while bus-02 logs in there 20 times with the
 * ingester's client id (`takeover-0`), the ingester (of bus-01 and bus-02, on `ingester_url`) running:
 * how often it had to reconnect, and what the store holds against what was sent.
 */
export async function streamUnderTakeover(o: {
  vehicle_url: string;
  ingester_url: string;
  dir: string;
  protocol: 4 | 5;
  share_group: string;
  env?: Record<string, string>;
}): Promise<{
  kicks: number;
  stored: { count: number; power_sum: number };
  sent: { count: number; power_sum: number };
}> {
  const store = createSqliteStore({ path: join(o.dir, 'takeover.db') });
  const ingester = await startFleetIngester({
    mqtt_url: o.ingester_url,
    dir: o.dir,
    ids: ['bus-01', 'bus-02'],
    client_id: 'takeover',
    share_group: o.share_group,
    store,
    ...(o.env ? { env: o.env } : {}),
  });
  const stream = fleetStream(['bus-01'], 400);
  const publishing = publishStream(o.vehicle_url, stream, 20, undefined, o.protocol);
  const before = ingester.metrics.broker_reconnects;
  for (let i = 0; i < 20; i++) {
    const c = await connectAs(o.vehicle_url, 'bus-02', {
      clientId: 'takeover-0',
      protocolVersion: o.protocol,
      reconnectPeriod: 0,
    }).catch(() => undefined);
    await sleep(20);
    await c?.endAsync(true);
  }
  await sleep(300);
  await publishing;
  const kicks = ingester.metrics.broker_reconnects - before;
  const sent = expectedTotals(stream);
  const stored = await waitForCount(store, ['bus-01'], sent.count);
  await ingester.stop();
  await store.close();
  return { kicks, stored, sent };
}
