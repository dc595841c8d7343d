import { join } from 'node:path';
import { createAnalyzer } from '@thermargin/analyzer/analyzer';
import { sizingInputFromStore } from '@thermargin/usecases/sizing-input';
import { sizeFleet } from '@thermargin/core/sizing/fleet-sizing';
import { resolveSizingOptions } from '@thermargin/core/sizing/options';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { createScenario } from '@thermargin/simulator';
import { createSqliteStore } from '@thermargin/store';
import { createAnalysisStore, openResultsDb } from '@thermargin/store/sqlite-analysis-store';
import { describe, expect, it } from 'vitest';
import { tempDir } from '../ingester/support.ts';

describe('sizing input from the stores', () => {
  it('after retention deleted old samples: those trips count as without samples, the rest is sized', async () => {
    const scenario = createScenario({ vehicles: 1, days: 4, seed: 11 });
    const dir = tempDir('sizing-input');
    const samples = createSqliteStore({ path: join(dir, 'samples.db'), synchronous: 'normal' });
    const results = createAnalysisStore(openResultsDb(join(dir, 'results.db')));
    const models = resolveFleet(scenario.fleet);
    const id = models[0]!.id;
    try {
      await samples.writeSamples([...scenario.vehicleSamples(id)]);
      const analyzer = createAnalyzer({
        samples,
        results,
        fleet: () => new Map(models.map((m) => [m.id, m])),
        clock: () => scenario.history.to_ms + 3_600_000,
      });
      await analyzer.runOnce();
      const o = resolveSizingOptions();
      const all = await sizingInputFromStore(samples, results, models, o);
      expect(all.trips_without_samples).toBe(0);
      const trips = all.input.trips.get(id)!;
      const sampled = sizeFleet(all.input, o).period.samples;

      // Retention keeps the last two days: the older trips lose their samples, not their results.
      const cut_ms = scenario.history.to_ms - 2 * 86_400_000;
      await samples.deleteBefore(cut_ms);
      const kept = await sizingInputFromStore(samples, results, models, o);
      expect(kept.input.trips.get(id)).toEqual(trips);
      expect(kept.trips_without_samples).toBeGreaterThan(0);
      expect(kept.trips_without_samples).toBeLessThan(trips.length);
      const after = sizeFleet(kept.input, o);
      expect(after.period.trips).toBe(trips.length);
      expect(after.period.samples).toBeGreaterThan(0);
      expect(after.period.samples).toBeLessThan(sampled);
    } finally {
      await samples.close();
      await results.close();
    }
  });
});
