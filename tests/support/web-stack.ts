import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { type RunningApi, startApi } from '@thermargin/api/start';
import type { Sample } from '@thermargin/shared';
import { createScenario, type Scenario } from '@thermargin/simulator';
import { ensureWebBuilt } from '@thermargin/stack/web-build';
import { createSqliteStore, type DeadLetter, type FrameTally, type SqliteStore } from '@thermargin/store';
import { TOKENS } from '../services/api/stack.ts';

export { TOKENS };
export const ROOT = resolve(import.meta.dirname, '../..');

export interface WebStackOptions {
  vehicles?: number;
  days?: number;
  seed?: number;
  /** Vehicles whose samples are written only by `release()` (a live change to watch). */
  hold_back?: string[];
  /** Refused messages to put in the store's dead letters (the refused-data screen's input). */
  dead_letters?: Omit<DeadLetter, 'received_ms' | 'topic' | 'excerpt' | 'payload_bytes'>[];
  /** Frame tallies to put in the store (the refused-data screen's frames table). */
  frame_tallies?: FrameTally[];
}

export interface WebStack {
  /** The API and the dashboard on one port. */
  url: string;
  api: RunningApi;
  scenario: Scenario;
  samples: SqliteStore;
  /** Writes a held-back vehicle's samples and lets the in-process analyzer pick them up. */
  release(vehicle: string): Promise<void>;
  close(): Promise<void>;
}

const BATCH = 20_000;

async function writeAll(store: SqliteStore, samples: Iterable<Sample>): Promise<number> {
  let batch: Sample[] = [];
  let n = 0;
  for (const s of samples) {
    batch.push(s);
    if (batch.length === BATCH) {
      await store.writeSamples(batch);
      n += batch.length;
      batch = [];
    }
  }
  if (batch.length) await store.writeSamples(batch);
  return n + batch.length;
}

/**
 * The production API process (`startApi`, services/api/src/start.ts) in this process, on a free loopback
 * port: SQLite sample and results files in a fresh temp dir fed with a simulated fleet, the analyzer
 * running in the API, the built dashboard (built first when web/dist is missing or stale), and the
 * documented test tokens of tests/services/api/stack.ts. The clock sits one hour after the history, so
 * every trip is closed.
 */
export async function startWebStack(o: WebStackOptions = {}): Promise<WebStack> {
  ensureWebBuilt(ROOT, (line) => process.stderr.write(`${line}\n`));
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-web-'));
  const scenario = createScenario({ vehicles: o.vehicles ?? 6, days: o.days ?? 10, seed: o.seed ?? 1 });
  const fleetFile = join(dir, 'fleet.json');
  writeFileSync(fleetFile, JSON.stringify(scenario.fleet));
  const samplesPath = join(dir, 'samples.db');
  const samples = createSqliteStore({ path: samplesPath, synchronous: 'normal' });
  const held = new Set(o.hold_back ?? []);
  for (const v of scenario.fleet.vehicles)
    if (!held.has(v.id)) await writeAll(samples, scenario.vehicleSamples(v.id));
  const now_ms = scenario.history.to_ms + 3_600_000;
  if (o.dead_letters?.length)
    await samples.writeDeadLetters(
      o.dead_letters.map((d, i) => ({
        ...d,
        received_ms: now_ms - 60_000 * (i + 1),
        topic: `thermargin/v1/${d.vehicle || 'unknown'}/samples`,
        excerpt: '{}',
        payload_bytes: 2,
      })),
    );
  if (o.frame_tallies?.length) await samples.writeFrameTallies(o.frame_tallies);
  const api = await startApi({
    port: 0,
    clock: () => now_ms,
    log: () => {},
    env: {
      STORE_KIND: 'sqlite',
      STORE_SQLITE_PATH: samplesPath,
      STORE_SQLITE_SYNCHRONOUS: 'normal',
      RESULTS_SQLITE_PATH: join(dir, 'results.db'),
      FLEET_FILE: fleetFile,
      API_TOKENS: Object.entries(TOKENS)
        .map(([role, t]) => `${role}-user:${role}:${t}`)
        .join(','),
      API_WEB_DIST: join(ROOT, 'web/dist'),
      API_RUN_ANALYZER: '1',
      ANALYZER_POLL_MS: '500',
      API_RATE_LIMIT_PER_MIN: '60000',
      API_RATE_LIMIT_BURST: '10000',
    },
  });
  await api.analyzer!.runOnce();
  return {
    url: api.url,
    api,
    scenario,
    samples,
    async release(vehicle) {
      await writeAll(samples, scenario.vehicleSamples(vehicle));
      api.analyzer!.poke();
    },
    async close() {
      await api.close();
      await samples.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
