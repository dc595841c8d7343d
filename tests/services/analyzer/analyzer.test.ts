import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createAnalyzer } from '@thermargin/analyzer/analyzer';
import { columnsFromSamples, type Sample } from '@thermargin/shared';
import { createSqliteStore, type SqliteStore } from '@thermargin/store';
import {
  type AnalysisStore,
  createAnalysisStore,
  openResultsDb,
} from '@thermargin/store/sqlite-analysis-store';
import { createScenario } from '@thermargin/simulator';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { resolveFleet, type VehicleModel } from '@thermargin/core/vehicle/resolve';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const scenario = createScenario({ vehicles: 2, days: 3, seed: 3 });
const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));
const samplesOf = (id: string) => [...scenario.vehicleSamples(id)];
const dir = mkdtempSync(join(tmpdir(), 'thermargin-analyzer-'));
let store: SqliteStore;
let results: AnalysisStore;

/** The offline reference: the whole history at once through the same core functions. */
function offline(model: VehicleModel, samples: readonly Sample[]) {
  return vehicleResult(model, analyzeVehicle(model, columnsFromSamples(samples)).trips).result;
}

beforeAll(async () => {
  store = createSqliteStore({ path: join(dir, 'samples.db'), synchronous: 'normal' });
  results = createAnalysisStore(openResultsDb(join(dir, 'results.db')));
});
afterAll(async () => {
  await store.close();
  await results.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('analyzer: store → core → results', () => {
  const id = [...models.keys()][0]!;
  const all = samplesOf(id);
  const lastTime = all.at(-1)!.time_ms;
  let now = 0;
  const analyzer = () =>
    createAnalyzer(
      { samples: store, results, fleet: () => models, clock: () => now },
      { chunk_ms: 86_400_000 },
    );

  it('leaves the last trip open until no sample came for 5 minutes (injected clock)', async () => {
    await store.writeSamples(all);
    now = lastTime + 299_000;
    await analyzer().runOnce();
    const open = await results.readTripResults(id);
    const want = offline(models.get(id)!, all);
    expect(open.length).toBe(want.trips.length - 1);
    now = lastTime + 300_000;
    await analyzer().runOnce();
    expect((await results.readTripResults(id)).length).toBe(want.trips.length);
  });

  it('agrees exactly with the offline analysis of the same samples (one-day read ranges)', async () => {
    const want = offline(models.get(id)!, all);
    const got = await results.readVehicleResult(id);
    expect(got).toEqual(want);
    expect((await results.readAnalysis(id))!.analysed_to_ms).toBe(lastTime + 1);
  });

  it('is idempotent: another run changes nothing; a re-analysis gives the same result', async () => {
    const before = await results.readVehicleResult(id);
    const v0 = await results.version(id);
    await analyzer().runOnce();
    expect(await results.version(id)).toBe(v0);
    await analyzer().reanalyze({ vehicle: id });
    expect(await results.readVehicleResult(id)).toEqual(before);
    const since = Date.parse(before!.trips[3]!.start) + 60_000; // inside trip 3: that trip is redone whole
    await analyzer().reanalyze({ vehicle: id, since_ms: since });
    expect(await results.readVehicleResult(id)).toEqual(before);
  });

  it('restarts where it stopped: samples arriving in pieces give the same result as one backlog', async () => {
    const other = [...models.keys()][1]!;
    const s = samplesOf(other);
    const half = s.findIndex((x) => x.time_ms > s[0]!.time_ms + 36 * 3_600_000);
    await store.writeSamples(s.slice(0, half));
    now = s[half - 1]!.time_ms + 600_000;
    await analyzer().runOnce(); // a fresh instance each time, as after a crash
    await store.writeSamples(s.slice(half));
    now = s.at(-1)!.time_ms + 600_000;
    await analyzer().runOnce();
    expect(await results.readVehicleResult(other)).toEqual(offline(models.get(other)!, s));
  });

  it('re-baselines from maintenance added beside the fleet file', async () => {
    const before = await results.readVehicleResult(id);
    const mid = before!.trips[Math.floor(before!.trips.length / 2)]!.start.slice(0, 10);
    const entry = { date: mid, action: 'radiator_cleaned' as const };
    const a = createAnalyzer({
      samples: store,
      results,
      fleet: () => models,
      extraMaintenance: async () => [entry],
      clock: () => now,
    });
    await a.reassess(id);
    const model = { ...models.get(id)!, maintenance: [...models.get(id)!.maintenance, entry] };
    expect(await results.readVehicleResult(id)).toEqual(offline(model, all));
  });
});
