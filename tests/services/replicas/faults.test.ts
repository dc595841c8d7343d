import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type Sample, type TripResult } from '@thermargin/shared';
import { createScenario } from '@thermargin/simulator';
import { openResults, type ResultsBackend } from '@thermargin/store/results-backend';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort, waitFor } from '../../support/servers/free-port.ts';
import { type PostgresServer, startPostgres } from '../../support/servers/postgres.ts';
import { ServiceProcess } from '../../support/service-process.ts';
import { SseClient } from '../../support/sse-client.ts';
import { writeScenarioFiles } from '../../support/write-samples.ts';

/**
 * Two analyzers and two APIs as real processes on one PostgreSQL, a fleet's backlog waiting in the
 * sample store. Mid-backlog one analyzer is SIGKILLed while it holds a lease, PostgreSQL is restarted
 * (immediate shutdown), and one API is SIGKILLed while SSE clients stream from it. Afterwards: every
 * vehicle's results equal the offline analysis exactly, the analysis log shows each sample range
 * analysed once and no vehicle worked on by two replicas at once, and every SSE client, reconnected to
 * the surviving API with Last-Event-ID, has every trip.
 */
const TOKEN = 'test-viewer-token-0001';
const LEASE_TTL_MS = 3000;
const scenario = createScenario({ vehicles: 5, days: 5, seed: 11, end_ms: Date.now() - 2 * 3_600_000 });
const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));
const ids = [...models.keys()];
const dir = mkdtempSync(join(tmpdir(), 'thermargin-replicas-'));
let server: PostgresServer;
let url: string;
let results: ResultsBackend;
const services: ServiceProcess[] = [];
const clients: SseClient[] = [];
let healthPort: number;

/** The offline reference: the whole history at once through the same core functions as the CLI. */
const offline = new Map(
  ids.map((id) => {
    const model = models.get(id)!;
    const samples: Sample[] = [...scenario.vehicleSamples(id)];
    return [id, vehicleResult(model, analyzeVehicle(model, columnsFromSamples(samples)).trips).result];
  }),
);

async function sql<R extends pg.QueryResultRow>(text: string, params: unknown[] = []): Promise<R[]> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    return (await c.query<R>(text, params)).rows;
  } finally {
    await c.end();
  }
}

beforeAll(async () => {
  const { samples_path, fleet_file } = await writeScenarioFiles(dir, scenario);
  server = await startPostgres();
  url = await server.createDatabase('replicas');
  results = await openResults({ kind: 'postgres', url });
  const common = {
    STORE_KIND: 'sqlite',
    STORE_SQLITE_PATH: samples_path,
    FLEET_FILE: fleet_file,
    RESULTS_KIND: 'postgres',
    RESULTS_POSTGRES_URL: url,
  };
  for (const name of ['api-a', 'api-b']) {
    const port = await freePort();
    const api = new ServiceProcess(name, 'services/api/src/main.ts', {
      ...common,
      API_PORT: String(port),
      API_TOKENS: `viewer-user:viewer:${TOKEN}`,
      API_RUN_ANALYZER: '0',
      API_RATE_LIMIT_PER_MIN: '60000',
      API_RATE_LIMIT_BURST: '10000',
    }).start();
    services.push(api);
    (api as unknown as { url: string }).url = `http://127.0.0.1:${port}`;
  }
  const urls = services.map((s) => (s as unknown as { url: string }).url);
  for (const u of urls) await waitFor(`API ${u}`, async () => (await fetch(`${u}/api/health`)).ok, 60_000);
  // Two clients start on each API; each moves to the other when its stream breaks.
  for (let i = 0; i < 4; i++) clients.push(new SseClient(urls, TOKEN, i % 2));
  await Promise.all(clients.map((c) => c.connected));
  healthPort = await freePort();
  for (const name of ['analyzer-1', 'analyzer-2'])
    services.push(
      new ServiceProcess(name, 'services/analyzer/src/main.ts', {
        ...common,
        ...(name === 'analyzer-1' ? { ANALYZER_HEALTH_PORT: String(healthPort) } : {}),
        ANALYZER_POLL_MS: '300',
        ANALYZER_REPLICA: name,
        ANALYZER_LEASE_TTL_MS: String(LEASE_TTL_MS),
      }),
    );
}, 300_000);

afterAll(async () => {
  for (const c of clients) await c.close();
  for (const s of services) await s.stop('SIGKILL');
  await results?.close();
  await server?.close();
});

describe('replicas on PostgreSQL under faults', () => {
  let killedLease: { vehicle: string; epoch: number; expires_at: Date } | undefined;

  it('an analyzer paused past its lease is fenced off, then killed; PostgreSQL restarted; an API killed: the fleet is analysed', async () => {
    const [apiA, , analyzer1, analyzer2] = services;
    analyzer1!.start();
    const health = `http://127.0.0.1:${healthPort}/health`;
    await waitFor(
      'analyzer-1 answering /health',
      async () => {
        if (!analyzer1!.running) throw new Error(analyzer1!.log());
        return (await fetch(health)).ok;
      },
      120_000,
    );
    // Frozen (SIGSTOP) in the middle of a commit on a lease, a pause longer than the lease, as a
    // stalled machine would make: its open transaction holds the vehicle's lock, the lease row and the
    // change counter's lock until the server ends it after the lease time
    // (idle_in_transaction_session_timeout); without that analyzer-2 would wait on it for ever.
    await waitFor(
      'analyzer-1 mid-commit on a lease',
      async () => {
        if (!analyzer1!.running) throw new Error(analyzer1!.log());
        process.kill(analyzer1!.pid!, 'SIGSTOP');
        const [held] = await sql<{ vehicle: string; epoch: number; expires_at: Date }>(
          `SELECT l.vehicle, l.epoch::int, l.expires_at FROM vehicle_leases l WHERE l.holder = 'analyzer-1'
             AND l.expires_at > clock_timestamp() AND NOT EXISTS (SELECT 1 FROM analysis_log a
               WHERE a.vehicle = l.vehicle AND a.holder = l.holder AND a.epoch = l.epoch)
             AND EXISTS (SELECT 1 FROM pg_stat_activity WHERE application_name = 'thermargin analyzer-1'
               AND state = 'idle in transaction')`,
        );
        if (held) killedLease = held;
        else process.kill(analyzer1!.pid!, 'SIGCONT');
        return held !== undefined;
      },
      180_000,
    );
    analyzer2!.start();
    const vehicle = killedLease!.vehicle;
    await waitFor(
      `analyzer-2 taking ${vehicle} over`,
      async () =>
        (await sql("SELECT 1 FROM analysis_log WHERE vehicle = $1 AND holder = 'analyzer-2'", [vehicle]))
          .length > 0,
      180_000,
    );
    // Woken, analyzer-1 finishes its stale work on the vehicle: its commit is refused (or, frozen
    // before it read the watermark, it finds the work done; the log below shows no commit of that
    // lease either way); a whole pass later it is killed.
    process.kill(analyzer1!.pid!, 'SIGCONT');
    const runs = async () => ((await (await fetch(health)).json()) as { runs: number }).runs;
    const resumedAt = await runs();
    await waitFor(
      'analyzer-1 to finish a pass after waking',
      async () => (await runs()) >= resumedAt + 2,
      60_000,
    );
    await analyzer1!.stop('SIGKILL');
    await server.restart();
    await apiA!.stop('SIGKILL');
    await waitFor(
      'every vehicle analysed to its last trip',
      async () => {
        for (const id of ids) {
          const got = await results.analysis.readVehicleResult(id);
          if (got?.trips.length !== offline.get(id)!.trips.length) return false;
        }
        return true;
      },
      300_000,
    );
    for (const id of ids) expect(await results.analysis.readVehicleResult(id)).toEqual(offline.get(id));
  }, 600_000);

  it('the analysis log shows each range analysed once and no vehicle held by two replicas at once', async () => {
    const log = await sql<{
      vehicle: string;
      holder: string;
      began_at: Date;
      committed_at: Date;
      epoch: number;
      from_ms: number | null;
      to_ms: number;
    }>(
      'SELECT vehicle, holder, epoch::int, began_at, committed_at, from_ms::float8, to_ms::float8 FROM analysis_log ORDER BY id',
    );
    for (const id of ids) {
      const rows = log.filter((r) => r.vehicle === id);
      expect(rows.length).toBeGreaterThan(0);
      // A chain: each commit starts where the one before ended, so no range is analysed twice or skipped.
      expect(rows[0]!.from_ms).toBeNull();
      for (let i = 1; i < rows.length; i++) expect(rows[i]!.from_ms).toBe(rows[i - 1]!.to_ms);
      expect(
        rows.some(
          (r) =>
            r.holder === 'analyzer-1' && r.vehicle === killedLease!.vehicle && r.epoch === killedLease!.epoch,
        ),
      ).toBe(false);
      for (const a of rows)
        for (const b of rows)
          if (a.holder !== b.holder)
            expect(
              a.committed_at < b.began_at || b.committed_at < a.began_at,
              `${id}: ${a.holder} and ${b.holder} overlap`,
            ).toBe(true);
    }
    // The vehicle analyzer-1 held when frozen went to analyzer-2, only after the lease had expired.
    const taken = log.filter((r) => r.vehicle === killedLease!.vehicle && r.holder === 'analyzer-2');
    expect(taken.length).toBeGreaterThan(0);
    expect(taken.at(-1)!.began_at.getTime()).toBeGreaterThanOrEqual(killedLease!.expires_at.getTime());
  });

  it('every SSE client, moved to the surviving API with Last-Event-ID, has every trip and status once', async () => {
    const want = new Set(ids.flatMap((id) => offline.get(id)!.trips.map((t) => `${id}/${t.trip}`)));
    const tripsOf = (c: SseClient) =>
      c.events
        .filter((e) => e.event === 'trip')
        .map((e) => JSON.parse(e.data) as { vehicle: string; trip: TripResult });
    await waitFor(
      'every client to have every trip',
      async () =>
        clients.every(
          (c) => want.size === new Set(tripsOf(c).map((t) => `${t.vehicle}/${t.trip.trip}`)).size,
        ),
      120_000,
    ).catch(() => {}); // the assertions below say what is missing
    for (const c of clients) {
      const got = new Set(tripsOf(c).map((t) => `${t.vehicle}/${t.trip.trip}`));
      expect(got).toEqual(want);
      const eventIds = c.events.filter((e) => e.id !== undefined).map((e) => e.id);
      expect(new Set(eventIds).size).toBe(eventIds.length); // no change told twice
      // Window evidence is for the vehicle stage: numbered trip events, like the API's reads, leave it out.
      expect(tripsOf(c).filter((t) => t.trip.windows !== undefined)).toEqual([]);
    }
    // Status changes are numbered too: each client's last one per vehicle is the vehicle's status.
    for (const c of clients)
      for (const id of ids) {
        const last = c.events
          .filter((e) => e.event === 'status')
          .map((e) => JSON.parse(e.data) as { vehicle: string; to: string })
          .filter((s) => s.vehicle === id)
          .at(-1);
        expect(last?.to, id).toBe(offline.get(id)!.status);
      }
    // The clients that started on the killed API reconnected.
    expect(clients.filter((c) => c.reconnects > 0).length).toBeGreaterThanOrEqual(2);
  }, 180_000);
});
