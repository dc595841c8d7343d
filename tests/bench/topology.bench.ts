/**
 * `npm run bench:topology`: a simulated fleet driving live (replayed at SPEEDUP× its own pace) through
 * docker-compose.yml's topology as processes — 2 ingesters (shared subscription), InfluxDB, 2 analyzers
 * (PostgreSQL leases), the API — and, in the same run on the same replay, through the single-process
 * shape (`npm start`: ingester, analyzer and API in one process, SQLite). Prints the sample rate carried,
 * the lag from a trip's last sample to its result (p50/p99), and CPU per vehicle of each service,
 * with what one core carries at 1 Hz. Asserts nothing. The machine is shared: read figures as such.
 */
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type Sample } from '@thermargin/shared';
import { createScenario, publishScenario, type Scenario } from '@thermargin/simulator';
import Database from 'better-sqlite3';
import pg from 'pg';
import { freePort, waitFor } from '../support/servers/free-port.ts';
import { startMosquitto } from '../support/servers/mosquitto.ts';
import { ServiceProcess } from '../support/service-process.ts';
import { startTopology } from '../support/topology.ts';
import { machineBusy_s, processCpu_s } from './cpu-meter.ts';

const VEHICLES = Number(process.env.BENCH_VEHICLES ?? 24);
const SPEEDUP = Number(process.env.BENCH_SPEEDUP ?? 240);
const WALL_S = Number(process.env.BENCH_WALL_S ?? 90);
const RATE_HZ = 1; // the simulator's sample rate
const log = (line: string) => process.stdout.write(`${line}\n`);

/** CPU seconds of a process and every descendant (PostgreSQL forks a backend per connection). */
function treeCpu_s(root: number | undefined): number {
  if (root === undefined) return 0;
  const children = new Map<number, number[]>();
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(d)]);
    } catch {}
  }
  let sum = 0;
  const walk = (pid: number) => {
    sum += processCpu_s(pid);
    for (const c of children.get(pid) ?? []) walk(c);
  };
  walk(root);
  return sum;
}

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.floor(q * s.length))]! : Number.NaN;
};

interface Replay {
  scenario: Scenario;
  from_ms: number;
  to_ms: number;
  fleetFile: string;
  /** Per vehicle: the trips ending inside the replay (time of their last sample). */
  closings: Map<string, { end_ms: number }[]>;
}

function makeReplay(): Replay {
  // Past sample times: a trip counts as ended once its last sample is stored (no sample for the trip
  // gap by the clock), so the lag measured is the pipeline's own: hand-over → stored → analysed.
  const scenario = createScenario({ vehicles: VEHICLES, days: 3, seed: 7, end_ms: Date.UTC(2026, 5, 20) });
  // The replay starts at the busiest hour of the second day, so the fleet is on the road.
  const day = scenario.history.from_ms + 86_400_000;
  const perHour = new Array<number>(24).fill(0);
  for (const s of scenario.fleetSamples({ from_ms: day, to_ms: day + 86_400_000 }))
    perHour[Math.floor((s.time_ms - day) / 3_600_000)]!++;
  const from_ms = day + perHour.indexOf(Math.max(...perHour)) * 3_600_000;
  const to_ms = from_ms + WALL_S * SPEEDUP * 1000;
  const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));
  const closings = new Map<string, { end_ms: number }[]>();
  for (const v of scenario.fleet.vehicles) {
    const samples = [...scenario.vehicleSamples(v.id, { from_ms: scenario.history.from_ms, to_ms })];
    const trips = analyzeVehicle(models.get(v.id)!, columnsFromSamples(samples)).trips;
    closings.set(
      v.id,
      trips
        .map((t) => ({ end_ms: Date.parse(t.end) }))
        .filter((t) => t.end_ms >= from_ms && t.end_ms < to_ms),
    );
  }
  const fleetFile = join(mkdtempSync(join(tmpdir(), 'thermargin-bench-topology-')), 'fleet.json');
  writeFileSync(fleetFile, JSON.stringify(scenario.fleet));
  return { scenario, from_ms, to_ms, fleetFile, closings };
}

const credentialsFor = (password: (u: string) => string) => (vehicle: string) => ({
  username: vehicle,
  password: password(vehicle),
});

/** The history before the replay, at full speed (not measured). */
async function backfill(r: Replay, url: string, password: (u: string) => string): Promise<void> {
  await publishScenario(null, r.scenario, {
    url,
    credentials: credentialsFor(password),
    range: { from_ms: r.scenario.history.from_ms, to_ms: r.from_ms },
  });
}

/** The replay paced at SPEEDUP; `wall` gets each sample's hand-over time (± the 200 ms batching). */
async function replay(r: Replay, url: string, password: (u: string) => string, wall: Map<string, number>) {
  const t0 = Date.now();
  async function* paced(): AsyncIterable<Sample> {
    for await (const s of r.scenario.fleetSamples({ from_ms: r.from_ms, to_ms: r.to_ms })) {
      const wait = t0 + (s.time_ms - r.from_ms) / SPEEDUP - Date.now();
      if (wait > 5) await new Promise((res) => setTimeout(res, wait));
      wall.set(`${s.vehicle}@${s.time_ms}`, Date.now());
      yield s;
    }
  }
  const out = await publishScenario(null, r.scenario, {
    url,
    credentials: credentialsFor(password),
    samples: paced(),
    flush_ms: 200,
  });
  return { samples: out.samples, wall_s: (Date.now() - t0) / 1000 };
}

/** Polls the watermarks; per vehicle the wall time each new watermark was first seen. */
function watchWatermarks(read: () => Promise<{ vehicle: string; analysed_to_ms: number }[]>) {
  const seen = new Map<string, { to_ms: number; at: number }[]>();
  let stop = false;
  const done = (async () => {
    while (!stop) {
      const now = Date.now();
      for (const row of await read().catch(() => [])) {
        const list = seen.get(row.vehicle) ?? [];
        if (!list.length || list.at(-1)!.to_ms !== row.analysed_to_ms)
          list.push({ to_ms: row.analysed_to_ms, at: now });
        seen.set(row.vehicle, list);
      }
      await new Promise((res) => setTimeout(res, 250));
    }
  })();
  return {
    /** s: for each trip ending in the replay, from its last sample's hand-over to the watermark passing it. */
    lags(r: Replay, wall: Map<string, number>): number[] {
      const out: number[] = [];
      for (const [vehicle, list] of r.closings)
        for (const c of list) {
          const published = wall.get(`${vehicle}@${c.end_ms}`);
          const analysed = seen.get(vehicle)?.find((w) => w.to_ms > c.end_ms);
          if (published !== undefined && analysed) out.push(Math.max(0, analysed.at - published) / 1000);
        }
      return out;
    },
    async stop() {
      stop = true;
      await done;
    },
  };
}

interface Figures {
  samples: number;
  wall_s: number;
  lags: number[];
  /** CPU seconds per process during the replay. */
  cpu: Record<string, number>;
  machine_s: number;
}

interface Shape {
  url: string;
  password: (u: string) => string;
  pids: Record<string, number | undefined>;
  watermarks: () => Promise<{ vehicle: string; analysed_to_ms: number }[]>;
  stop(): Promise<void>;
}

async function measure(r: Replay, shape: Shape): Promise<Figures> {
  try {
    await backfill(r, shape.url, shape.password);
    const watch = watchWatermarks(shape.watermarks);
    const cpu0 = Object.fromEntries(Object.entries(shape.pids).map(([n, pid]) => [n, treeCpu_s(pid)]));
    const machine0 = machineBusy_s();
    const wall = new Map<string, number>();
    const out = await replay(r, shape.url, shape.password, wall);
    // The results of the last trips (up to 60 s more; a trip not analysed by then counts as unseen).
    const want = [...r.closings.values()].reduce((n, l) => n + l.length, 0);
    const deadline = Date.now() + 60_000;
    while (Date.now() < deadline && watch.lags(r, wall).length < want)
      await new Promise((res) => setTimeout(res, 500));
    const cpu = Object.fromEntries(
      Object.entries(shape.pids).map(([n, pid]) => [n, treeCpu_s(pid) - (cpu0[n] ?? 0)]),
    );
    const machine_s = machineBusy_s() - machine0;
    await watch.stop();
    return { samples: out.samples, wall_s: out.wall_s, lags: watch.lags(r, wall), cpu, machine_s };
  } finally {
    await shape.stop();
  }
}

async function multiProcess(r: Replay): Promise<Shape> {
  const ids = r.scenario.fleet.vehicles.map((v) => v.id);
  const t = await startTopology({ fleetFile: r.fleetFile, vehicles: ids, env: { ANALYZER_POLL_MS: '1000' } });
  const client = new pg.Client({ connectionString: t.resultsUrl });
  await client.connect();
  return {
    url: t.mosquitto.url,
    password: t.password,
    pids: {
      mosquitto: t.mosquitto.process.pid,
      influxdb: t.influx.process.pid,
      postgres: t.postgres.process.pid,
      ...Object.fromEntries([...t.services].map(([n, s]) => [n, s.pid])),
    },
    watermarks: async () =>
      (await client.query('SELECT vehicle, analysed_to_ms::float8 AS analysed_to_ms FROM vehicle_analysis'))
        .rows,
    async stop() {
      await client.end();
      await t.stop();
    },
  };
}

/** `npm start`'s process (ingester, analyzer, API in one; SQLite) on the same Mosquitto. */
async function singleProcess(r: Replay): Promise<Shape> {
  const ids = r.scenario.fleet.vehicles.map((v) => v.id);
  const password = (u: string) => `test-${u}-pw`;
  const mosquitto = await startMosquitto([
    { username: 'ingester', password: password('ingester'), role: 'ingester' },
    ...ids.map((id) => ({ username: id, password: password(id), role: 'vehicle' as const })),
  ]);
  const data = mkdtempSync(join(tmpdir(), 'thermargin-bench-single-'));
  const stack = new ServiceProcess('stack', 'services/stack/src/start.ts', {
    THERMARGIN_DATA_DIR: data,
    THERMARGIN_SIMULATE: '0',
    FLEET_FILE: r.fleetFile,
    INGEST_MQTT_URL: mosquitto.ingester_url,
    INGEST_MQTT_USERNAME: 'ingester',
    INGEST_MQTT_PASSWORD: password('ingester'),
    API_PORT: String(await freePort()),
    ANALYZER_POLL_MS: '1000',
  }).start();
  await waitFor('npm start', async () => stack.log().includes('API token:'), 600_000);
  const db = new Database(join(data, 'results.db'), { readonly: true, fileMustExist: false });
  return {
    url: mosquitto.url,
    password,
    pids: { mosquitto: mosquitto.process.pid, 'npm start (one process)': stack.pid },
    watermarks: async () => {
      try {
        return db.prepare('SELECT vehicle, analysed_to_ms FROM vehicle_analysis').all() as {
          vehicle: string;
          analysed_to_ms: number;
        }[];
      } catch {
        return []; // the table is created by the first commit
      }
    },
    async stop() {
      db.close();
      await stack.stop('SIGINT');
      await mosquitto.close();
    },
  };
}

function report(name: string, f: Figures, r: Replay): Record<string, number> {
  const vehicleHours = (f.wall_s * SPEEDUP * VEHICLES) / 3600;
  const closed = [...r.closings.values()].reduce((n, l) => n + l.length, 0);
  log(`\n${name}`);
  log(
    `  ${VEHICLES} vehicles × ${RATE_HZ} Hz × ${SPEEDUP}× (${VEHICLES * SPEEDUP} vehicles live) = ${(f.samples / f.wall_s).toFixed(0)} samples/s carried for ${f.wall_s.toFixed(0)} s`,
  );
  log(
    `  lag from a trip's last sample to its result: p50 ${quantile(f.lags, 0.5).toFixed(1)} s, p99 ${quantile(f.lags, 0.99).toFixed(1)} s (${f.lags.length} of ${closed} trips within 60 s of the replay's end; analyzer poll 1 s)`,
  );
  log('  CPU per vehicle-hour of 1 Hz data, and vehicles one core carries live at 1 Hz:');
  const perVehicle: Record<string, number> = {};
  for (const [proc, s] of Object.entries(f.cpu)) {
    const ms = (s * 1000) / vehicleHours;
    perVehicle[proc] = ms;
    log(
      `    ${proc.padEnd(24)} ${ms.toFixed(1).padStart(8)} ms   ${Math.floor(3_600_000 / ms)
        .toLocaleString('en-US')
        .padStart(9)} vehicles/core`,
    );
  }
  log(
    `  machine busy meanwhile (all processes, other users' too): ${(f.machine_s / f.wall_s).toFixed(2)} cores`,
  );
  return perVehicle;
}

const r = makeReplay();
log(
  `replay: ${VEHICLES} vehicles, ${((r.to_ms - r.from_ms) / 3_600_000).toFixed(1)} h of driving at ${SPEEDUP}× in ${WALL_S} s; the machine is shared (load now ${readFileSync('/proc/loadavg', 'utf8').split(' ')[0]})`,
);
const multi = report(
  'multi-process (compose topology: 2 ingesters, InfluxDB, 2 analyzers, PostgreSQL, API)',
  await measure(r, await multiProcess(r)),
  r,
);
const single = report(
  'single process (npm start: ingester + analyzer + API, SQLite)',
  await measure(r, await singleProcess(r)),
  r,
);
const sum = (o: Record<string, number>, keys: (k: string) => boolean) =>
  Object.entries(o)
    .filter(([k]) => keys(k))
    .reduce((n, [, v]) => n + v, 0);
const ours = sum(multi, (k) => /^(ingester|analyzer|api)/.test(k));
log(
  `\nthermargin's own processes, ms per vehicle-hour: multi ${ours.toFixed(1)} vs single ${single['npm start (one process)']!.toFixed(1)} (ratio ${(ours / single['npm start (one process)']!).toFixed(2)}); servers in the multi shape: ${sum(multi, (k) => !/^(ingester|analyzer|api)/.test(k)).toFixed(1)}`,
);
process.exit(0);
