import { DAY_MS } from '@thermargin/shared/time';
/**
 * `npm run bench:api`: latency and rate of the API's heaviest reads with 1 000 vehicles × a year of trips
 * in the results store, beside a trivial route's rate in the same run, and the analyzer's backlog
 * throughput on a month of a small fleet beside the store read alone and the core alone on the same
 * samples. Prints figures; asserts nothing. The load generator is a child process (this file with
 * `load`: keep-alive agent, bounded concurrency) on loopback, so it does not share the server's event
 * loop; both CPU times are printed per request.
 */
import { type ChildProcess, fork } from 'node:child_process';
import { once } from 'node:events';
import { Agent, request, type Server } from 'node:http';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { createAnalyzer } from '@thermargin/analyzer/analyzer';
import { fileFleetSource } from '@thermargin/api/fleet-source';
import { createApi } from '@thermargin/api/app';
import { parseTokenList, TokenRegistry } from '@thermargin/api/tokens';
import type { Sample, TripResult, VehicleConfigInput } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { createAnalysisStore, openResultsDb } from '@thermargin/store/sqlite-analysis-store';
import { createWorkflowStore } from '@thermargin/store/sqlite-workflow';
import { createScenario } from '@thermargin/simulator';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { READ_DEFAULTS } from '@thermargin/usecases/options';
import { serve } from '@hono/node-server';
import { BUS_CONFIG } from '../support/vehicle-fixture.ts';

const VEHICLES = Number(process.env.BENCH_VEHICLES ?? 1000);
const TRIPS_PER_DAY = 2;
const DAYS = 365;
const REQUESTS = Number(process.env.BENCH_REQUESTS ?? 2000);
/** requests in flight: 1 for latency (no queueing in the figures), 16 for the rate. */
const CONCURRENCY = [1, 16] as const;
const PATTERNS = 10;
const T0 = Date.UTC(2025, 6, 1);
const fmt = (x: number) => Math.round(x).toLocaleString('en-US');
const iso = (ms: number) => new Date(ms).toISOString().replace(/\.000Z$/, 'Z');
const cpuMs = (u: NodeJS.CpuUsage) => (u.user + u.system) / 1000;

/** A plausible trip result: k falling slowly (fouling), noise from a fixed sequence (no Math.random). */
function tripResult(v: number, j: number): TripResult {
  const start = T0 + Math.floor(j / TRIPS_PER_DAY) * DAY_MS + (7 + (j % TRIPS_PER_DAY) * 7) * 3_600_000;
  const wobble = Math.sin(v * 7.1 + j * 1.3);
  const k = 55 * (1 - (0.15 * j) / (DAYS * TRIPS_PER_DAY)) + wobble;
  return {
    trip: `t${j}`,
    start: iso(start),
    end: iso(start + 3 * 3_600_000),
    samples: 10_800,
    rejected: 0,
    distance_km: 120,
    k_ram_w_m2k: k,
    k_ram_ci95: [k - 2, k + 2],
    n_ram: 4000,
    k_ram_reason: null,
    k_fan_w_m2k: k * 0.8,
    k_fan_ci95: [k * 0.8 - 2, k * 0.8 + 2],
    n_fan: 900,
    k_fan_reason: null,
    heat_kw_mean: 60,
    heat_kw_p95: 110,
    heat_kw_max: 130,
    heat_kwh: 180,
    derate_s: 0,
    coolant_max_c: 84,
    ambient_max_c: 30 + 5 * wobble,
    margin_pct: 12 - (8 * j) / (DAYS * TRIPS_PER_DAY) + wobble,
    limiting_ambient_c: 44 + wobble,
    margin_basis: 'fan',
    ambient_mean_c: 25,
    soak_offset_k: null,
    fan_saturated_share: 0.05,
    coolant_dt_per_kw: null,
    sensor_flags: [],
  };
}

interface LoadJob {
  url: string;
  path: string;
  token: string;
  concurrency: number;
  gzip: boolean;
}
interface LoadResult {
  p50: number;
  p99: number;
  rps: number;
  /** CPU ms of the load generator itself. */
  cpu_ms: number;
  /** bytes of the last answer, as sent. */
  bytes: number;
}

/** The load generator's side: REQUESTS requests of one path, `concurrency` in flight. */
async function load({ url, path, token, concurrency, gzip }: LoadJob): Promise<LoadResult> {
  const agent = new Agent({ keepAlive: true, maxSockets: concurrency });
  const lat: number[] = [];
  const headers = { authorization: `Bearer ${token}`, ...(gzip ? { 'accept-encoding': 'gzip' } : {}) };
  let bytes = 0;
  const one = () =>
    new Promise<void>((resolve, reject) => {
      const t = performance.now();
      const req = request(`${url}${path}`, { agent, headers }, (res) => {
        let got = 0;
        res.on('data', (d: Buffer) => {
          got += d.length;
        });
        res.on('end', () => {
          if (res.statusCode !== 200) reject(new Error(`${path}: ${res.statusCode}`));
          lat.push(performance.now() - t);
          bytes = got;
          resolve();
        });
      });
      req.on('error', reject);
      req.end();
    });
  for (let i = 0; i < 20; i++) await one(); // warm the caches
  lat.length = 0;
  let next = 0;
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  await Promise.all(
    Array.from({ length: concurrency }, async () => {
      while (next++ < REQUESTS) await one();
    }),
  );
  const s = (performance.now() - t0) / 1000;
  const cpu_ms = cpuMs(process.cpuUsage(cpu0));
  agent.destroy();
  lat.sort((a, b) => a - b);
  const q = (p: number) => lat[Math.min(lat.length - 1, Math.floor(p * lat.length))]!;
  return { p50: q(0.5), p99: q(0.99), rps: REQUESTS / s, cpu_ms, bytes };
}

/** Runs one job in the child; also gives the server's CPU ms over the same time. */
async function remoteLoad(
  child: ChildProcess,
  job: LoadJob,
): Promise<LoadResult & { server_cpu_ms: number }> {
  const cpu0 = process.cpuUsage();
  child.send(job);
  const [r] = (await once(child, 'message')) as [LoadResult];
  return { ...r, server_cpu_ms: cpuMs(process.cpuUsage(cpu0)) };
}

async function apiLatency(dir: string): Promise<void> {
  const configs: VehicleConfigInput[] = Array.from({ length: VEHICLES }, (_, v) => ({
    ...BUS_CONFIG,
    id: `bus-${String(v).padStart(4, '0')}`,
  }));
  const fleetFile = join(dir, 'fleet.json');
  writeFileSync(fleetFile, JSON.stringify({ vehicles: configs }));
  const fleet = fileFleetSource(fleetFile);
  const samples = createSqliteStore({ path: join(dir, 'samples.db'), synchronous: 'normal' });
  const db = openResultsDb(join(dir, 'results.db'));
  db.pragma('synchronous = NORMAL');
  const results = createAnalysisStore(db);
  const workflow = createWorkflowStore(db);
  const t0 = performance.now();
  const models = [...fleet.current().models.values()];
  // Assessing a year of trips is the slow part of the setup, so PATTERNS histories are assessed and
  // every vehicle gets one of them under its own id: realistic sizes without minutes of setup.
  const outcomes = Array.from({ length: PATTERNS }, (_, v) =>
    vehicleResult(
      models[v]!,
      Array.from({ length: DAYS * TRIPS_PER_DAY }, (_, j) => tripResult(v, j)),
    ),
  );
  for (const [v, m] of models.entries()) {
    const { result, assessment } = outcomes[v % PATTERNS]!;
    const { series, notes, candidates } = assessment;
    await results.commit({
      vehicle: m.id,
      trips: result.trips,
      result: { ...result, id: m.id },
      analysis: {
        analysed_to_ms: T0 + DAYS * DAY_MS,
        previous_end_ms: null,
        last_trip: null,
        rejected: {},
        assessment: { series, notes, candidates },
      },
      now_ms: T0,
    });
  }
  console.log(
    `results store: ${fmt(VEHICLES)} vehicles × ${DAYS * TRIPS_PER_DAY} trips written and assessed in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
  );
  // One vehicle-trip's samples for the trace: 3 h at 1 Hz, a highway/idle cycle.
  const first = models[0]!.id;
  const start = Date.parse(tripResult(0, 0).start);
  const trace: Sample[] = Array.from({ length: 10_800 }, (_, i) => {
    const phase = Math.floor(i / 600) % 2;
    return {
      time_ms: start + i * 1000,
      vehicle: first,
      trip: 't0',
      speed_kmh: phase ? 85 : 8,
      power_kw: phase ? 90 : 25,
      coolant_in_c: 82 + Math.sin(i / 50),
      ambient_c: 30,
      fan_pct: phase ? 5 : 95,
    };
  });
  await samples.writeSamples(trace);
  const token = 'bench-viewer-token-0001';
  const app = createApi({
    samples,
    results,
    workflow,
    fleet,
    tokens: new TokenRegistry(parseTokenList(`bench:viewer:${token}`, 'env'), workflow),
    rate_limit: { per_minute: 1e9, burst: 1e9 },
  });
  const server = serve({ fetch: app.fetch, port: 0, hostname: '127.0.0.1' }) as Server;
  await new Promise<void>((r) => server.once('listening', r));
  server.keepAliveTimeout = 60_000; // the load generator keeps its sockets between rows
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const vehicle = `/api/vehicles/${models[1]!.id}`;
  // A browser asks for gzip; a script may not.
  const rows: [string, string, boolean][] = [
    ['baseline GET /api/health', '/api/health', false],
    ['fleet summary GET /api/fleet', '/api/fleet', false],
    ['fleet summary, gzip', '/api/fleet', true],
    ['one vehicle GET /api/vehicles/{id}', vehicle, false],
    ['one vehicle, gzip', vehicle, true],
    ['trip trace 2 000 points', `/api/vehicles/${first}/trips/t0?points=2000`, false],
  ];
  const child = fork(fileURLToPath(import.meta.url), ['load'], { stdio: 'inherit' });
  console.log(
    `\n${REQUESTS} requests per row, keep-alive, loopback, load generator in its own process; latency with ${CONCURRENCY[0]} in flight, rate and CPU with ${CONCURRENCY[1]}`,
  );
  console.log(
    'route                                  p50 ms   p99 ms   requests/s   server CPU ms/req   client CPU ms/req    KiB',
  );
  for (const [name, path, gzip] of rows) {
    const lat = await remoteLoad(child, { url, path, token, gzip, concurrency: CONCURRENCY[0] });
    const rate = await remoteLoad(child, { url, path, token, gzip, concurrency: CONCURRENCY[1] });
    console.log(
      `${name.padEnd(38)} ${lat.p50.toFixed(2).padStart(7)}  ${lat.p99.toFixed(2).padStart(7)}  ${fmt(rate.rps).padStart(11)}   ${(rate.server_cpu_ms / REQUESTS).toFixed(3).padStart(17)}   ${(rate.cpu_ms / REQUESTS).toFixed(3).padStart(17)}  ${(rate.bytes / 1024).toFixed(0).padStart(5)}`,
    );
  }
  child.disconnect();
  server.close();
  await results.close();
  await samples.close();
}

async function backlog(dir: string): Promise<void> {
  const scenario = createScenario({ vehicles: 3, days: 30, seed: 1 });
  const samples = createSqliteStore({ path: join(dir, 'backlog.db'), synchronous: 'normal' });
  let n = 0;
  const tw = performance.now();
  for (const m of scenario.fleet.vehicles) {
    const all = [...scenario.vehicleSamples(m.id)];
    n += all.length;
    await samples.writeSamples(all);
  }
  const write_s = (performance.now() - tw) / 1000;
  const results = createAnalysisStore(openResultsDb(join(dir, 'backlog-results.db')));
  const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));
  const spans = await samples.listVehicles();
  // The store read alone, in the analyzer's ranges, and the core alone on what it read.
  const chunk = READ_DEFAULTS.chunk_ms;
  const tr = performance.now();
  const cr = process.cpuUsage();
  const read = [];
  for (const s of spans)
    for (let f = s.first_ms; f <= s.last_ms; f += chunk)
      read.push({ id: s.vehicle, c: await samples.readSamples(s.vehicle, f, f + chunk) });
  const read_s = (performance.now() - tr) / 1000;
  const read_cpu_s = cpuMs(process.cpuUsage(cr)) / 1000;
  const tc = performance.now();
  for (const { id, c } of read) analyzeVehicle(models.get(id)!, c);
  const core_s = (performance.now() - tc) / 1000;
  read.length = 0;
  const analyzer = createAnalyzer({
    samples,
    results,
    fleet: () => models,
    clock: () => scenario.history.to_ms + DAY_MS,
  });
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  await analyzer.runOnce();
  const s = (performance.now() - t0) / 1000;
  const cpu_s = cpuMs(process.cpuUsage(c0)) / 1000;
  const rate = (x: number) => `${fmt(n / x).padStart(11)} samples/s`;
  console.log(
    `\nanalyzer backlog: ${fmt(n)} samples (${scenario.fleet.vehicles.length} vehicles × 30 days, SQLite, written in ${write_s.toFixed(1)} s = ${fmt(n / write_s)} samples/s)`,
  );
  console.log(
    `  store read alone (${chunk / DAY_MS}-day ranges) ${rate(read_s)}   (CPU ${rate(read_cpu_s)})`,
  );
  console.log(`  core alone (analyzeVehicle per range)  ${rate(core_s)}`);
  console.log(
    `  analyzer runOnce (${analyzer.stats.trips_analysed} trips)     ${rate(s)}   (CPU ${rate(cpu_s)}) = ${((100 * s) / (read_s + core_s)).toFixed(0)} % of read + core time`,
  );
  await results.close();
  await samples.close();
}

if (process.argv[2] === 'load') {
  process.on('message', async (job: LoadJob) => process.send!(await load(job)));
} else {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-bench-api-'));
  try {
    await apiLatency(dir);
    await backlog(dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
