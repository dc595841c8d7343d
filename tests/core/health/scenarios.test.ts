import { describe, expect, it } from 'vitest';
import { assessVehicle } from '../../../core/src/health/assess.ts';
import { HEALTH_DEFAULTS } from '../../../core/src/health/options.ts';
import { marginThresholds } from '../../../core/src/health/thresholds.ts';
import { generateScenario } from '../../support/health-fleet/generate.ts';
import { firstDay, firstStatus, firstTrueStatus } from '../../support/health-fleet/metrics.ts';
import { table } from '../../support/health-fleet/report.ts';
import { type Run, type RunFigures, run } from '../../support/health-fleet/run.ts';
import {
  EVENT_DAY,
  PARAMETER_SETS,
  SCENARIOS,
  type ScenarioName,
  type SetName,
  scenarioParams,
} from '../../support/health-fleet/scenarios.ts';

/**
 * Health acceptance on the seeded trip-level generator (tests/support/health-fleet): set A is what
 * the defaults were tried on, set B (other vehicle type, noise, trip rate, τ, bench baseline) was not,
 * set C was added after the defaults were fixed.
 */
const SETS = Object.keys(PARAMETER_SETS) as SetName[];
const SEEDS = [1, 2, 3, 4, 5];
const all: RunFigures[] = [];
const done = new Map<ScenarioName, Run[]>();
/** Each scenario's runs, made once (its figures go once into the closing-note table). */
const runs = (scenario: ScenarioName): Run[] => {
  let rs = done.get(scenario);
  if (!rs) {
    rs = SETS.flatMap((set) => SEEDS.map((seed) => run(set, scenario, seed)));
    all.push(...rs.map((r) => r.f));
    done.set(scenario, rs);
  }
  return rs;
};
const label = (r: Run) => `${r.f.set}/${r.f.scenario}/seed ${r.f.seed}`;

describe('health assessment on generated fleets', () => {
  it('healthy vehicles over 180 days: no inspect, at most one watch and it clears', () => {
    for (const r of runs('healthy')) {
      const statuses = r.a.trips.map((t) => t.status);
      expect(statuses, label(r)).not.toContain('inspect');
      const watches = statuses.filter((s, i) => s === 'watch' && statuses[i - 1] !== 'watch').length;
      expect(watches, label(r)).toBeLessThanOrEqual(1);
      expect(r.a.status, label(r)).toBe('ok');
      expect(r.a.projected_inspect_date, label(r)).toBeNull();
    }
  });

  it('a chart statistic hovering at its limit makes one change point, not one per crossing', () => {
    const { rearm_trips } = HEALTH_DEFAULTS;
    let changes = 0;
    for (const sc of ['healthy', 'fouling', 'fan'] as const)
      for (const r of runs(sc))
        for (const band of ['ram', 'fan'] as const) {
          const b = r.a.series[band];
          if (!b) continue;
          // The band's charted trips in time order (the input is not), and whether the charts signalled.
          const t = r.a.series.time_ms;
          const charted = [...t.keys()].filter((i) => b.cusum[i] !== null).sort((i, j) => t[i]! - t[j]!);
          const alarm = charted.map((i) => b.ewma[i]! < b.ewma_lcl[i]! || b.cusum[i]! > b.cusum_h);
          const at = b.change_points
            .filter((c) => c.detector !== 'step')
            .map((c) => charted.findIndex((i) => t[i] === Date.parse(c.signal)));
          changes += at.length;
          for (const [j, x] of at.entries()) {
            if (j === 0) continue;
            let quiet = 0;
            for (let y = at[j - 1]! + 1; y < x; y++) quiet = alarm[y] ? 0 : quiet + 1;
            expect(quiet, `${label(r)} ${band} change ${j}`).toBeGreaterThanOrEqual(rearm_trips);
          }
        }
    expect(changes).toBeGreaterThan(0);
  });

  it('each change point says how far the level moved: a few points on healthy bands, tens for a failed fan', () => {
    const shifts = (sc: ScenarioName, band: 'ram' | 'fan') =>
      runs(sc).flatMap((r) => (r.a.series[band]?.change_points ?? []).map((c) => c.shift_pct));
    const healthy = [...shifts('healthy', 'ram'), ...shifts('healthy', 'fan')];
    expect(healthy.length).toBeGreaterThan(0);
    for (const x of healthy) expect(Math.abs(x!)).toBeLessThan(5);
    for (const r of runs('fan')) {
      const fell = (r.a.series.fan?.change_points ?? []).map((c) => c.shift_pct ?? 0);
      expect(Math.min(...fell), label(r)).toBeLessThan(-30);
    }
  });

  it('asymptotic fouling: watch, then inspect with cause fouling, never while the truth is ok', () => {
    for (const r of runs('fouling')) {
      const gw = firstStatus(r.a, 'watch')!;
      const gi = firstStatus(r.a, 'inspect')!;
      expect(gw, label(r)).toBeLessThan(gi);
      expect(r.a.cause, label(r)).toBe('fouling');
      expect(r.a.alerts.find((x) => x.status === 'inspect')?.cause, label(r)).toBe('fouling');
      expect(gi, label(r)).toBeGreaterThanOrEqual(firstTrueStatus(r.s, 'watch')!);
    }
  });

  /**
   * The crossing is judged in margin, not in trips: near it, asymptotic fouling moves the margin by
   * only 0.06–0.3 points per trip, while one trip's margin scatters by 3–4.5 points (k noise 2.5–4.5 %)
   * and only the design band's trips carry it. The level's standard error (≈ 1–1.5 points after ~40
   * design-band trips) is then 5–25 trips of fall, so "5 trips" cannot be promised on every fleet;
   * within 3 margin points of the threshold (under one trip's noise) can, on ten seeds per set.
   */
  it('asymptotic fouling: at the first inspect the true margin is within 3 points of the threshold', () => {
    for (const set of SETS) {
      for (let seed = 1; seed <= 10; seed++) {
        const r = run(set, 'fouling', seed);
        const gi = firstStatus(r.a, 'inspect')!;
        const v = r.s.vehicle;
        const th = marginThresholds(v.policy, v.coolant_limit_c, v.design.ambient_c).inspect_enter;
        expect(Math.abs(r.s.truth[gi]!.margin_pct - th), `${set}/fouling/seed ${seed}`).toBeLessThanOrEqual(
          3,
        );
      }
    }
  });

  it('part-way into fouling: a projected date never says "later" than the true crossing with confidence', () => {
    let projected = 0;
    for (const set of SETS) {
      for (const seed of SEEDS) {
        const p = scenarioParams(set, 'fouling', seed);
        const crossDay = generateScenario(p).truth.find((t) => t.status === 'inspect')!.day;
        for (const share of [0.5, 0.7]) {
          const early = generateScenario({ ...p, days: Math.round(crossDay * share) });
          const a = assessVehicle(early.vehicle, early.trips);
          expect(a.status).not.toBe('inspect');
          const iv = a.series.projection.interval;
          if (a.projected_inspect_date === null) {
            expect(a.series.projection.reason).toMatch(/cannot tell|no significant|not judged/);
            continue;
          }
          projected++;
          const lo = iv?.[0] ?? null;
          expect(lo, `${set}/${seed}/${share}`).not.toBeNull();
          expect((Date.parse(lo!) - Date.parse(early.trips[0]!.start)) / 864e5).toBeLessThanOrEqual(
            crossDay + 1,
          );
        }
      }
    }
    expect(projected).toBeGreaterThan(0);
  });

  it('fan losing 70 % airflow: cause fan within 5 fan-band trips, ram health unchanged', () => {
    for (const r of runs('fan')) {
      expect(r.f.delay_trips, label(r)).not.toBeNull();
      expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(5);
      expect(r.a.cause, label(r)).toBe('fan');
      // Unchanged: within 6 % of the clean radiator's health (1 ÷ the bench factor when bench k ≠ clean k).
      const clean = 1 / (r.s.params.bench_factor ?? 1);
      expect(Math.abs(r.a.health.ram! / clean - 1), label(r)).toBeLessThan(0.06);
      expect(r.a.health.fan!, label(r)).toBeLessThan(0.7);
    }
  });

  it('fan failing on a fouling core: cause fan within 5 fan-band trips, though the detectors were already out of control', () => {
    for (const r of runs('fouled_fan')) {
      expect(r.f.delay_trips, label(r)).not.toBeNull();
      expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(5);
      expect(r.a.cause, label(r)).toBe('fan');
      expect(
        r.a.series.fan.change_points.map((c) => c.detector),
        label(r),
      ).toContain('step');
    }
  });

  it('after a recorded cleaning the vehicle recovers to ok', () => {
    for (const r of runs('cleaning')) {
      const ev = firstDay(r.s, EVENT_DAY.cleaning)!;
      expect(r.a.trips[ev - 1]!.status, label(r)).toBe('inspect');
      expect(r.f.delay_trips, label(r)).not.toBeNull();
      expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(10);
    }
  });

  it('ambient sensor 6 K high: sensor within 5 cold starts, radiator never blamed, improvement flagged', () => {
    for (const r of runs('sensor')) {
      expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(5);
      const ev = firstDay(r.s, EVENT_DAY.sensor)!;
      expect(r.a.cause, label(r)).toBe('sensor');
      const since = r.a.alerts.filter((a) => Date.parse(a.time) >= Date.parse(r.s.trips[ev]!.start));
      expect(
        since.map((a) => a.cause),
        label(r),
      ).not.toContain('fouling');
      expect(
        since.map((a) => a.cause),
        label(r),
      ).not.toContain('coolant_flow');
      expect(
        r.a.candidates.map((c) => c.cause),
        label(r),
      ).not.toContain('fouling');
      const after = r.a.series.margin.level_pct.slice(ev).filter((m): m is number => m !== null);
      const before = r.a.series.margin.level_pct[ev - 1]!;
      if (Math.max(...after) > before + 2) {
        expect(r.a.cause_evidence, label(r)).toMatch(/not credible/);
        expect(r.a.notes.join(' '), label(r)).toMatch(/not credible/);
        expect(
          r.a.alerts.some((a) => /not credible/.test(a.detail)),
          label(r),
        ).toBe(true);
      }
    }
  });

  // With half the trips flagged, 3 flagged of the last 10 comes within 16 trips in all but ≈ 0.2 % of runs (binomial).
  it('ambient sensor 6 K low (k looks smaller): sensor within 5 cold starts, radiator not blamed once a cold start shows it', () => {
    for (const r of runs('sensor_low')) {
      expect(r.f.delay_trips, label(r)).not.toBeNull();
      expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(5);
      expect(r.a.cause, label(r)).toBe('sensor');
      const ev = firstDay(r.s, EVENT_DAY.sensor_low)!;
      const cold = r.s.truth.findIndex((t, i) => i >= ev && t.cold_start);
      const since = r.a.alerts.filter((a) => Date.parse(a.time) >= Date.parse(r.s.trips[cold]!.start));
      expect(
        since.map((a) => a.cause),
        label(r),
      ).toEqual(since.map(() => 'sensor'));
    }
  });

  it('sensor flags on half the trips: cause sensor within 16 trips and held while they go on', () => {
    for (const r of runs('flags')) {
      expect(r.f.delay_trips, label(r)).not.toBeNull();
      expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(16);
      expect(r.a.cause, label(r)).toBe('sensor');
      expect(r.a.cause_evidence, label(r)).toMatch(/implausible signals on \d+ of the last 10 trips/);
      const ev = firstDay(r.s, EVENT_DAY.flags)!;
      const after = r.a.alerts.filter((a) => Date.parse(a.time) >= Date.parse(r.s.trips[ev]!.start));
      expect(
        after.map((a) => a.cause),
        label(r),
      ).not.toContain('fouling');
    }
  });

  it('coolant flow loss: named from the outlet temperature where there is one, else ranked with its limits', () => {
    for (const r of runs('coolant')) {
      if (r.s.params.outlet_sensor) {
        expect(r.f.delay_trips, label(r)).not.toBeNull();
        expect(r.f.delay_trips!, label(r)).toBeLessThanOrEqual(10);
        expect(r.a.cause, label(r)).toBe('coolant_flow');
        expect(r.a.cause_evidence, label(r)).toMatch(/radiator temperature drop per kW up/);
      } else {
        const c = r.a.candidates.find((x) => x.cause === 'coolant_flow');
        expect(c?.evidence, label(r)).toMatch(/no radiator outlet temperature to confirm/);
        expect(r.a.notes.join(' '), label(r)).toMatch(/coolant flow cannot be confirmed/);
      }
    }
  });

  it('sparse data: says so instead of guessing', () => {
    for (const r of runs('sparse')) {
      expect(r.a.cause, label(r)).toBe('none');
      expect(r.a.projected_inspect_date, label(r)).toBeNull();
      if (r.a.health.fan === null) {
        expect(r.a.notes.join(' '), label(r)).toMatch(
          /fan band reached on \d+ of \d+ trips: fan health not judged/,
        );
        expect(r.a.cause_evidence, label(r)).toMatch(/not enough data/);
      }
    }
    expect(all.filter((f) => f.scenario === 'sparse').length).toBeGreaterThan(0);
  });

  it('prints detection delays and false alarms for the closing note', () => {
    console.log(`\n${table(all)}`);
    expect(all.length).toBe(SETS.length * SEEDS.length * SCENARIOS.length);
  });
});
