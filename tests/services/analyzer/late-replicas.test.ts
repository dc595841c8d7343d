import { join } from 'node:path';
import { createAnalyzer } from '@thermargin/analyzer/analyzer';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { columnsFromSamples, type Sample } from '@thermargin/shared';
import { createScenario } from '@thermargin/simulator';
import { createSqliteStore } from '@thermargin/store';
import { openResults } from '@thermargin/store/results-backend';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type PostgresServer, startPostgres } from '../../support/servers/postgres.ts';
import { tempDir } from '../ingester/support.ts';

const dir = tempDir('late-replicas');
const scenario = createScenario({ vehicles: 2, days: 3, seed: 17 });
const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));
const ids = [...models.keys()];
let server: PostgresServer;

beforeAll(async () => {
  server = await startPostgres();
}, 120_000);
afterAll(async () => {
  await server?.close();
});

describe('late samples with analyzer replicas', () => {
  it("a pass clears only the late marks of vehicles it analysed under its own lease, not another replica's", async () => {
    const url = await server.createDatabase('late_replicas');
    const mine = await openResults({ kind: 'postgres', url }, { holder: 'replica-a' });
    const other = await openResults({ kind: 'postgres', url }, { holder: 'replica-b' });
    const store = createSqliteStore({ path: join(dir, 'samples.db'), synchronous: 'normal' });
    const all = new Map(ids.map((id) => [id, [...scenario.vehicleSamples(id)]]));
    // Each vehicle's samples of the middle of its history held back, then sent late.
    const held = (s: Sample[]) => [Math.floor(s.length / 2), Math.floor(s.length / 2) + 200] as const;
    const now = Math.max(...[...all.values()].map((s) => s.at(-1)!.time_ms)) + 600_000;
    const analyzer = createAnalyzer({
      samples: store,
      results: mine.analysis,
      leases: mine.leases!,
      fleet: () => models,
      clock: () => now,
    });
    try {
      for (const s of all.values()) {
        const [lo, hi] = held(s);
        await store.writeSamples([...s.slice(0, lo), ...s.slice(hi)]);
      }
      await analyzer.runOnce();
      for (const s of all.values()) await store.writeSamples(s.slice(...held(s)));
      const busy = ids[0]!;
      // The other replica is on `busy`: this pass must leave its marks to whoever analyses it.
      const lease = await other.leases!.acquire(busy);
      expect(lease).not.toBeNull();
      await analyzer.runOnce();
      expect(new Set((await store.lateMarks()).map((m) => m.vehicle))).toEqual(new Set([busy]));
      await other.leases!.release(lease!);
      await analyzer.runOnce();
      expect(await store.lateMarks()).toEqual([]);
      for (const [id, s] of all) {
        const model = models.get(id)!;
        expect(await mine.analysis.readVehicleResult(id)).toEqual(
          vehicleResult(model, analyzeVehicle(model, columnsFromSamples(s)).trips).result,
        );
      }
    } finally {
      await store.close();
      await mine.close();
      await other.close();
    }
  });
});
