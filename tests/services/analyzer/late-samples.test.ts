import { join } from 'node:path';
import { createAnalyzer } from '@thermargin/analyzer/analyzer';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveFleet, type VehicleModel } from '@thermargin/core/vehicle/resolve';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { columnsFromSamples, type Sample } from '@thermargin/shared';
import { createScenario } from '@thermargin/simulator';
import { createSqliteStore } from '@thermargin/store';
import { createAnalysisStore, openResultsDb } from '@thermargin/store/sqlite-analysis-store';
import { describe, expect, it } from 'vitest';
import { tempDir } from '../ingester/support.ts';

const dir = tempDir('late');
const scenario = createScenario({ vehicles: 2, days: 4, seed: 11 });
const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));

/** The offline reference (what `thermargin analyze` computes): the whole history at once. */
const offline = (model: VehicleModel, samples: readonly Sample[]) =>
  vehicleResult(model, analyzeVehicle(model, columnsFromSamples(samples)).trips).result;

/** Trips of the full history as index ranges into `all` (split where the offline analysis split them). */
function tripRanges(model: VehicleModel, all: readonly Sample[]): [number, number][] {
  const starts = offline(model, all).trips.map((t) => Date.parse(t.start));
  return starts.map((s, k) => {
    const lo = all.findIndex((x) => x.time_ms >= s);
    const hi = k + 1 < starts.length ? all.findIndex((x) => x.time_ms >= starts[k + 1]!) : all.length;
    return [lo, hi];
  });
}

type Hold = (all: readonly Sample[], trips: [number, number][], pick: number) => [number, number];
/** Which samples arrive late: a whole trip, a trip's last part, a piece inside a trip. */
const HOLDS: Record<string, Hold> = {
  'a whole trip': (_a, trips, k) => trips[k]!,
  "a trip's last part": (_a, trips, k) => {
    const [lo, hi] = trips[k]!;
    return [Math.floor((lo + hi) / 2), hi];
  },
  'a piece inside a trip': (_a, trips, k) => {
    const [lo, hi] = trips[k]!;
    return [lo + Math.floor((hi - lo) / 3), lo + Math.floor((2 * (hi - lo)) / 3)];
  },
};

describe('samples that arrive after their time was analysed', () => {
  let n = 0;
  for (const [what, hold] of Object.entries(HOLDS)) {
    for (const id of models.keys()) {
      it(`${what} of ${id} a day late: the trips it touches are analysed again, equal to the offline analysis`, async () => {
        const model = models.get(id)!;
        const all = [...scenario.vehicleSamples(id)];
        const trips = tripRanges(model, all);
        // A trip of the day before the last, as a logger uploading its buffer after a day offline.
        const dayBefore = all.at(-1)!.time_ms - 1.5 * 86_400_000;
        const k = trips.findIndex(([lo]) => all[lo]!.time_ms >= dayBefore) - 1 - (n % 3);
        const [lo, hi] = hold(all, trips, Math.max(1, k));
        const store = createSqliteStore({ path: join(dir, `samples-${n}.db`), synchronous: 'normal' });
        const results = createAnalysisStore(openResultsDb(join(dir, `results-${n++}.db`)));
        const now = all.at(-1)!.time_ms + 600_000;
        const analyzer = createAnalyzer({ samples: store, results, fleet: () => models, clock: () => now });
        await store.writeSamples([...all.slice(0, lo), ...all.slice(hi)]);
        await analyzer.runOnce();
        expect(await results.readVehicleResult(id)).toEqual(
          offline(model, [...all.slice(0, lo), ...all.slice(hi)]),
        );

        await store.writeSamples(all.slice(lo, hi));
        await analyzer.runOnce();
        expect(await results.readVehicleResult(id)).toEqual(offline(model, all));
        expect(analyzer.stats.late_samples).toBe(hi - lo);
        expect(analyzer.stats.backlog_vehicles).toBe(0);
        expect(await store.lateMarks()).toEqual([]);
        await store.close();
        await results.close();
      });
    }
  }
});
