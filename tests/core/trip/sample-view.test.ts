import { columnsFromSamples } from '@thermargin/shared';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { cleanSamples } from '@thermargin/core/trip/clean';
import { ESTIMATOR_DEFAULTS } from '@thermargin/core/trip/estimator-options';
import { tripSampleView } from '@thermargin/core/trip/sample-view';
import { splitTrips } from '@thermargin/core/trip/split';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { createScenario } from '@thermargin/simulator';
import { describe, expect, it } from 'vitest';

describe('tripSampleView: per-sample heat, k and band membership', () => {
  const s = createScenario({ vehicles: 1, days: 1, seed: 11 });
  const model = resolveFleet(s.fleet)[0]!;
  const { columns: c } = cleanSamples(columnsFromSamples([...s.vehicleSamples(model.id)]));
  const trips = analyzeVehicle(model, columnsFromSamples([...s.vehicleSamples(model.id)])).trips;

  it('counts exactly the samples the trip result counted per band (same window rules)', () => {
    const spans = splitTrips(c);
    expect(spans.length).toBe(trips.length);
    spans.forEach((span, j) => {
      const v = tripSampleView(c, span.from, span.to, model, ESTIMATOR_DEFAULTS);
      const count = (code: number) => v.counted.reduce((n, b) => n + (b === code ? 1 : 0), 0);
      expect(count(1)).toBe(trips[j]!.n_ram);
      expect(count(2)).toBe(trips[j]!.n_fan);
    });
  });

  it('k is set exactly where a sample counted, and the band median of window k matches the trip k', () => {
    const j = trips.findIndex((t) => t.k_ram_w_m2k !== null);
    expect(j, 'the scenario day has a trip with a ram band k').toBeGreaterThanOrEqual(0);
    const span = splitTrips(c)[j]!;
    const v = tripSampleView(c, span.from, span.to, model, ESTIMATOR_DEFAULTS);
    for (let i = 0; i < v.counted.length; i++) expect(Number.isNaN(v.k_w_m2k[i]!)).toBe(v.counted[i] === 0);
    const ks = [...new Set([...v.k_w_m2k].filter((_k, i) => v.counted[i] === 1))].sort((a, b) => a - b);
    const mid = ks.length % 2 ? ks[(ks.length - 1) / 2]! : (ks[ks.length / 2 - 1]! + ks[ks.length / 2]!) / 2;
    expect(mid).toBeCloseTo(trips[j]!.k_ram_w_m2k!, 0);
  });
});
