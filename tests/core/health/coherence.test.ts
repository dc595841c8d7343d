import type { TripResult } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { assessVehicle } from '../../../core/src/health/assess.ts';
import { overdueDays } from '../../../core/src/health/due.ts';
import { TripMargins } from '../../../core/src/health/trip-margins.ts';
import { coherenceProblems } from '../../support/health-fleet/coherence.ts';
import { generateScenario } from '../../support/health-fleet/generate.ts';
import { run } from '../../support/health-fleet/run.ts';
import {
  EVENT_DAY,
  PARAMETER_SETS,
  SCENARIOS,
  type SetName,
  scenarioParams,
} from '../../support/health-fleet/scenarios.ts';

/**
 * Every figure of a vehicle agrees with the others, on the seeded trip-level generator's scenarios:
 * the margin per trip comes from the band that governs the design point, the trend and projection
 * start at the margin's last step and agree with its level, the finding and the alerts quote the
 * trend's one rate, a vehicle at inspect reads as overdue.
 */
const SETS = Object.keys(PARAMETER_SETS) as SetName[];
const SEEDS = [1, 2, 3];

describe('coherent figures on generated fleets', () => {
  it('trend, projection, finding and status agree, part-way through every scenario and at its end', () => {
    let judged = 0;
    for (const set of SETS)
      for (const scenario of SCENARIOS)
        for (const seed of SEEDS.slice(0, 2))
          for (const share of [0.6, 1]) {
            const p = scenarioParams(set, scenario, seed);
            const s = generateScenario({ ...p, days: Math.max(5, Math.round(p.days * share)) });
            const a = assessVehicle(s.vehicle, s.trips);
            expect(coherenceProblems(a), `${set}/${scenario}/seed ${seed}/${share}`).toEqual([]);
            if (a.series.margin.trend) judged++;
          }
    expect(judged).toBeGreaterThan(SETS.length * SCENARIOS.length * 2);
  });

  it('after a fan fault every trip shows it in its margin, ram-only trips too, where the fan band governs', () => {
    for (const scenario of ['fan', 'fouled_fan'] as const)
      for (const set of SETS)
        for (const seed of SEEDS) {
          const r = run(set, scenario, seed);
          const m = r.a.series.margin;
          const label = `${set}/${scenario}/seed ${seed}`;
          // From the first trip whose fan-band k can show the fault.
          const first = r.s.trips.findIndex(
            (t, i) => r.s.truth[i]!.day >= EVENT_DAY[scenario] && t.k_fan_w_m2k !== null,
          );
          const after = m.pct.slice(first);
          if (m.basis === 'fan') {
            expect(after.length, label).toBeGreaterThan(20);
            for (const [k, v] of after.entries())
              expect(v, `${label} trip ${first + k} (${m.source[first + k]})`).toBeLessThan(
                m.watch_below_pct,
              );
            expect(m.source.slice(first), label).toContain('band_level');
          } else {
            // The design point lies in the ram band: the fan takes nothing from its margin, the status
            // comes from the fan band's health.
            expect(r.a.status, label).toBe('inspect');
            expect(r.a.cause, label).toBe('fan');
          }
        }
  });

  it("an alert quotes the trend as it was at the alert's trip, from the same place as the tile", () => {
    let quoted = 0;
    for (const set of SETS)
      for (const seed of SEEDS) {
        const r = run(set, 'fouling', seed);
        const byStart = [...r.s.trips].sort((x, y) => Date.parse(x.start) - Date.parse(y.start));
        for (const alert of r.a.alerts) {
          const rate = /margin (falling|rising) ([\d.]+) points per 30 days/.exec(alert.detail);
          if (!rate) continue;
          quoted++;
          const upTo = byStart.filter((t) => Date.parse(t.end) <= Date.parse(alert.time));
          const then = assessVehicle(r.s.vehicle, upTo).series.margin.trend!;
          expect(then.word, alert.detail).toBe(rate[1]);
          expect(Math.abs(then.pct_per_30d).toFixed(1), alert.detail).toBe(rate[2]);
        }
      }
    expect(quoted).toBeGreaterThan(0);
  });

  it('an inspection date in the past reads as overdue, counted in calendar days', () => {
    const as = Date.parse('2026-07-31T06:00:00Z');
    expect(overdueDays('2026-07-21T08:14:00Z', as)).toBe(10);
    expect(overdueDays('2026-07-31T05:00:00Z', as)).toBe(0);
    expect(overdueDays('2026-07-31T07:00:00Z', as)).toBeNull();
    expect(overdueDays(null, as)).toBeNull();
    for (const set of SETS) {
      const r = run(set, 'fan', 1);
      expect(r.a.status).toBe('inspect');
      const last = Math.max(...r.s.trips.map((t) => Date.parse(t.end)));
      expect(r.a.projected_inspect_overdue_days).toBe(overdueDays(r.a.projected_inspect_date, last));
      expect(r.a.series.projection.reason).toMatch(/^inspection due since \d{4}-\d{2}-\d{2}$/);
    }
  });
});

describe('margin per trip from the governing band', () => {
  const trip = (k: Partial<TripResult>): TripResult =>
    ({
      margin_pct: null,
      limiting_ambient_c: null,
      margin_basis: null,
      sensor_flags: [],
      ...k,
    }) as TripResult;
  const lat = (m: number) => 100 - 60 / (1 + m / 100);

  it("takes the trip's own governing-band margin, else the band's level, else the other band (marked)", () => {
    const t = new TripMargins(4, 'fan', lat);
    t.take(trip({ margin_pct: 30, limiting_ambient_c: 53.8, margin_basis: 'ram' }), 0, 0, null);
    t.take(trip({ margin_pct: 20, limiting_ambient_c: 50, margin_basis: 'fan' }), 1, 1, 20);
    t.take(trip({ margin_pct: 30, limiting_ambient_c: 53.8, margin_basis: 'ram' }), 2, 2, 20);
    t.take(trip({ margin_pct: 25, margin_basis: 'fan', sensor_flags: ['stuck'] }), 3, 3, 20);
    expect(t.out.map((m) => [m.margin_pct, m.margin_basis, m.margin_source])).toEqual([
      [30, 'ram', 'other_band'],
      [20, 'fan', 'trip'],
      [20, 'fan', 'band_level'],
      [20, 'fan', 'band_level'],
    ]);
    expect(t.out[2]!.limiting_ambient_c).toBe(50);
  });

  it('trips between a change and its detection take the new level once it is found', () => {
    const t = new TripMargins(3, 'fan', lat);
    t.take(trip({ margin_pct: 30, margin_basis: 'ram' }), 0, 10, 20);
    t.take(trip({ margin_pct: 30, margin_basis: 'ram' }), 1, 20, 20);
    t.take(trip({ margin_pct: -25, margin_basis: 'fan' }), 2, 30, 20);
    t.changed(15, -25);
    expect(t.out.map((m) => m.margin_pct)).toEqual([20, -25, -25]);
  });

  it("re-assessing a vehicle result's own trips gives the same figures (the trip's own margin is kept aside)", () => {
    const r = run('A', 'fan', 2);
    const merged = r.s.trips.map((t, i) => ({ ...t, ...r.a.trips[i]! }));
    const again = assessVehicle(r.s.vehicle, merged);
    expect(again.trips).toEqual(r.a.trips);
    expect(again.series.margin).toEqual(r.a.series.margin);
  });
});
