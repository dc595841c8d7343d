import { describe, expect, it } from 'vitest';
import { AIRSIDE_DEFAULTS, bandFactor } from '../../../core/src/radiator/airside.ts';
import { createRng } from '../../../core/src/stats/prng.ts';
import { type HeatTrip, unmeasuredHeat } from '../../../core/src/trip/unmeasured-heat.ts';
import { emptyEvidence } from '../../../core/src/trip/windows.ts';

const SHAPE = { airside: { ...AIRSIDE_DEFAULTS }, area_m2: 0.8, engine_pump: false };
const empty = emptyEvidence;

/** Trips whose ram windows reject k·A·g·ITD; the traction heat misses `aux_kw`; meter optional. */
function trips(aux_kw: number, meter: boolean, count: number, seed: number): HeatTrip[] {
  const rng = createRng(seed);
  return Array.from({ length: count }, () => {
    const k = rng.uniform(2800, 3400);
    const e = empty();
    for (let i = 0; i < 15; i++) {
      const speed = rng.uniform(70, 100);
      const itd = rng.uniform(15, 45);
      const rejected = (k * SHAPE.area_m2 * bandFactor(SHAPE.airside, 'ram', speed, 0) * itd) / 1000;
      e.speed_kmh.push(speed);
      e.fan_pct.push(0);
      e.itd_k.push(itd);
      e.balance_kw.push(rejected - aux_kw + 0.3 * rng.normal());
      e.meter_kw.push(meter ? rejected * (1 + 0.005 * rng.normal()) : null);
      e.flow_lpm.push(meter ? 300 : null);
    }
    return { windows: { ram: e, fan: empty() }, ambient_correction_k: 0 };
  });
}

describe('unmeasured steady heat', () => {
  it('the fleet file value stands when given', () => {
    expect(unmeasuredHeat(1.5, trips(3, true, 10, 1), SHAPE)).toEqual({
      value_kw: 1.5,
      ci95: null,
      basis: 'fleet_file',
      trips: 0,
      reason: null,
    });
  });

  it('flow meter: the median over trips of meter − balance, with an interval excluding zero', () => {
    const h = unmeasuredHeat(null, trips(3, true, 12, 2), SHAPE);
    expect(h.basis).toBe('fitted');
    expect(h.value_kw).toBeCloseTo(3, 0);
    expect(h.ci95![0]).toBeLessThan(3);
    expect(h.ci95![1]).toBeGreaterThan(3);
    expect(h.trips).toBe(12);
  });

  it('no unmeasured heat: the interval includes zero, so none is used', () => {
    const h = unmeasuredHeat(null, trips(0, true, 12, 3), SHAPE);
    expect(h.basis).toBe('none');
    expect(h.value_kw).toBe(0);
    expect(h.reason).toMatch(/includes zero/);
  });

  it('heat balance alone, electric pump: the intercept of the balance against k·A·g·ITD', () => {
    const h = unmeasuredHeat(null, trips(4, false, 20, 4), SHAPE);
    expect(h.basis).toBe('fitted');
    expect(h.ci95![0]).toBeLessThan(4);
    expect(h.ci95![1]).toBeGreaterThan(4);
    expect(Math.abs(h.value_kw - 4)).toBeLessThan(1);
  });

  it('heat balance alone with an engine-driven pump: not read, and says why', () => {
    const h = unmeasuredHeat(null, trips(4, false, 20, 5), { ...SHAPE, engine_pump: true });
    expect(h.basis).toBe('none');
    expect(h.reason).toMatch(/engine drives the coolant pump/);
  });

  it('too few trips: not read', () => {
    expect(unmeasuredHeat(null, trips(3, true, 4, 6), SHAPE).reason).toMatch(/4 trips, need 6/);
  });
});
