import { resolvePolicy } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { latForMargin_c, marginForLat_pct, marginThresholds } from '../../../core/src/health/thresholds.ts';
import { StatusMachine } from '../../../core/src/health/status.ts';
import { REBASELINES } from '../../../core/src/health/rebaseline.ts';

describe('LAT thresholds as margins (docs/methods.md §3: margin and LAT from the same kA)', () => {
  it('limit 70 °C, design ambient 40 °C: LAT 45 °C ⇔ margin 20 %', () => {
    expect(marginForLat_pct(45, 70, 40)).toBeCloseTo(20, 12);
    expect(latForMargin_c(20, 70, 40)).toBeCloseTo(45, 12);
  });
  it('route hottest ambient 46 °C: inspect when the margin falls below 25 % (above the 0 % margin rule)', () => {
    const t = marginThresholds(resolvePolicy({ route_max_ambient_c: 46 }), 70, 40);
    expect(t.inspect_enter).toBeCloseTo(25, 12);
    expect(t.inspect_rule).toMatch(/LAT below 46/);
    expect(t.watch_enter).toBeCloseTo(100 * (30 / 19 - 1), 12);
    expect(t.inspect_clear).toBeCloseTo(marginForLat_pct(47, 70, 40), 12);
  });
  it('rejects a LAT threshold at or above the coolant limit', () => {
    expect(() => marginForLat_pct(70, 70, 40)).toThrow(/below the coolant limit/);
  });
});

describe('status hysteresis', () => {
  const p = resolvePolicy();
  const t = marginThresholds(p, 70, 40);
  const step = (m: StatusMachine, margin: number | null, drop: 0 | 1 | 2 = 0) =>
    m.step({
      margin_pct: margin,
      health: [1, 1],
      detected_drop: drop === 2,
      detected_drop_held: drop >= 1,
      sensor_suspect: false,
      coolant_suspect: false,
      margin_falling: false,
    }).status;
  it('enters at once, leaves only after trips_to_step_down trips above threshold + deadband', () => {
    const m = new StatusMachine(t, p);
    expect(step(m, 9)).toBe('watch');
    expect(step(m, 11)).toBe('watch'); // inside the 2-point deadband
    for (let i = 0; i < p.trips_to_step_down - 1; i++) expect(step(m, 13)).toBe('watch');
    expect(step(m, 13)).toBe('ok');
  });
  it('a fall of k enters watch at the watch drop and holds it down to the drop less the deadband', () => {
    const m = new StatusMachine(t, p);
    expect(step(m, 20, 2)).toBe('watch');
    for (let i = 0; i < 10; i++) expect(step(m, 20, 1)).toBe('watch'); // 6–8 % below: held
    for (let i = 0; i < p.trips_to_step_down - 1; i++) expect(step(m, 20)).toBe('watch');
    expect(step(m, 20)).toBe('ok');
  });
  it('reads the old key clear_trips as trips_to_step_down; the new key wins in the same layer', () => {
    expect(resolvePolicy({ clear_trips: 5 }).trips_to_step_down).toBe(5);
    expect(resolvePolicy({ clear_trips: 5, trips_to_step_down: 2 }).trips_to_step_down).toBe(2);
    expect(resolvePolicy({ trips_to_step_down: 2 }, { clear_trips: 4 }).trips_to_step_down).toBe(4);
    expect('clear_trips' in resolvePolicy({ clear_trips: 5 })).toBe(false);
  });
  it('holds while the margin is not judged (right after maintenance)', () => {
    const m = new StatusMachine(t, p);
    expect(step(m, -1)).toBe('inspect');
    for (let i = 0; i < 10; i++) expect(step(m, null)).toBe('inspect');
  });
});

describe('maintenance re-baselines', () => {
  it('a fan repair restarts only the fan band; a cleaning both', () => {
    expect(REBASELINES.fan_repaired).toEqual(['fan']);
    expect(REBASELINES.radiator_cleaned).toEqual(['ram', 'fan']);
  });
});
