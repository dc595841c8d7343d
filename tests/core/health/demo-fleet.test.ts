import { ColumnBuilder, NUMERIC_COLUMNS, type Sample } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { analyzeVehicle } from '../../../core/src/analyze.ts';
import { resolveSizingOptions } from '../../../core/src/sizing/options.ts';
import { sizeVehicle } from '../../../core/src/sizing/vehicle-sizing.ts';
import { vehicleResult } from '../../../core/src/vehicle-result.ts';
import { resolveVehicle } from '../../../core/src/vehicle/resolve.ts';
import { createScenario, type Scenario } from '../../../services/simulator/src/scenario.ts';
import { coherenceProblems } from '../../support/health-fleet/coherence.ts';

/**
 * The demo fleet's fault cases (services/simulator, `npm start`) through the whole core: samples →
 * trips → assessment, on two seeds (the physics and the fault times are drawn from the seed). The
 * failed fan (bus-03), fouling (bus-02) and coolant flow (truck-01) must read coherently.
 */
const IDS = ['bus-02', 'bus-03', 'truck-01'] as const;

function assessDemo(sc: Scenario, id: string) {
  const b = new ColumnBuilder();
  const row = new Float64Array(NUMERIC_COLUMNS.length);
  for (const s of sc.vehicleSamples(id)) {
    NUMERIC_COLUMNS.forEach((c, k) => {
      row[k] = (s as Sample)[c] ?? Number.NaN;
    });
    b.push(row, s.trip);
  }
  const config = sc.fleet.vehicles.find((v) => v.id === id)!;
  const model = resolveVehicle(config, sc.fleet.policy);
  return vehicleResult(model, analyzeVehicle(model, b.view()).trips);
}

describe.each([1, 2])('the demo fleet, seed %i', (seed) => {
  const sc = createScenario({ vehicles: 6, days: 21, seed });
  const got = Object.fromEntries(IDS.map((id) => [id, assessDemo(sc, id)]));

  it('each fault case reads coherently: trend, projection, finding and status agree', () => {
    for (const id of IDS) expect(coherenceProblems(got[id]!.assessment), id).toEqual([]);
    expect(got['bus-03']!.result.cause).toBe('fan');
    expect(got['bus-02']!.result.cause).toBe('fouling');
    expect(got['truck-01']!.result.cause).toBe('coolant_flow');
  });

  it('the failed fan shows in the margin of every trip once the fan band has seen it', () => {
    const { result, assessment } = got['bus-03']!;
    const fault = sc.vehicles.find((v) => v.id === 'bus-03')!.faults.find((f) => f.kind === 'fan_loss')!;
    const seen = result.trips.findIndex((t) => Date.parse(t.start) >= fault.at_ms && t.k_fan_w_m2k !== null);
    const after = result.trips.slice(seen);
    expect(assessment.series.margin.basis).toBe('fan');
    expect(after.length).toBeGreaterThan(5);
    for (const t of after) {
      expect(t.margin_pct, `${t.trip} (${t.margin_source}, own ${t.trip_margin_pct})`).toBeLessThan(
        assessment.series.margin.watch_below_pct,
      );
    }
    expect(result.status).toBe('inspect');
    expect(result.projected_inspect_overdue_days).not.toBeNull();
    expect(assessment.series.projection.reason ?? '').not.toMatch(/more than \d+ days ahead/);
  });

  it('sizing keeps the faults apart: no fouling allowance from a coolant loss or a failed fan', () => {
    const o = resolveSizingOptions({ what_if: [] });
    for (const id of IDS) {
      const { result } = got[id]!;
      const model = resolveVehicle(sc.fleet.vehicles.find((v) => v.id === id)!, sc.fleet.policy);
      const v = sizeVehicle(model, result.trips, null, o);
      for (const f of v.fouling)
        if (f.fouling_allowance !== null)
          expect(f.fouling_allowance, `${id} ${f.band}`).toBeLessThanOrEqual(o.max_fouling_allowance);
      expect(v.design_check!.margin_now_pct, id).toBe(result.margin_pct);
    }
    const band = (id: string, b: 'ram' | 'fan') =>
      sizeVehicle(
        resolveVehicle(sc.fleet.vehicles.find((v) => v.id === id)!, sc.fleet.policy),
        got[id]!.result.trips,
        null,
        o,
      ).fouling.find((f) => f.band === b)!;
    expect(band('bus-03', 'fan').left_out_cause).toBe('fan');
    expect(band('bus-03', 'ram').left_out_trips).toBe(0);
    expect(['coolant_flow', 'fan']).toContain(band('truck-01', 'ram').left_out_cause);
  });

  it('the margin the summary reads is the level of the governing band, with its trend', () => {
    for (const id of IDS) {
      const { result, assessment } = got[id]!;
      const last = assessment.series.time_ms.indexOf(Math.max(...assessment.series.time_ms));
      expect(result.margin_pct, id).toBe(assessment.series.margin.level_pct[last]);
      expect(result.trend ?? null, id).toBe(assessment.series.margin.trend?.word ?? null);
    }
  });
});

/**
 * `npm start`'s smoke-test demo (6 vehicles, 12 days) ends at the wall clock, so which trips it holds,
 * and which one is cut at the end, follow the time of day: its findings must hold at any end time.
 * Fixed instants, spread over the day, on three seeds.
 */
describe.each([
  [1, '2026-12-04T14:18:00Z'],
  [2, '2026-12-04T18:00:00Z'],
  [3, '2026-12-05T03:40:00Z'],
])('the 12-day smoke demo, seed %i, ending %s', (seed, end) => {
  it('names the fouling and the failed fan, and keeps the healthy bus ok', () => {
    const sc = createScenario({ vehicles: 6, days: 12, seed, end_ms: Date.parse(end) });
    const [healthy, fouling, fan] = ['bus-01', 'bus-02', 'bus-03'].map((id) => assessDemo(sc, id).result);
    const line = (r: typeof fan) => `${r!.id} ${r!.cause}/${r!.status}: ${r!.cause_evidence}`;
    expect(fouling!.cause, line(fouling)).toBe('fouling');
    expect(['watch', 'inspect'], line(fouling)).toContain(fouling!.status);
    expect(fan!.cause, line(fan)).toBe('fan');
    expect(['watch', 'inspect'], line(fan)).toContain(fan!.status);
    expect(healthy!.status, line(healthy)).toBe('ok');
  });
});
