import { describe, expect, it } from 'vitest';
import { AIRSIDE_DEFAULTS } from '../../../core/src/radiator/airside.ts';
import { type Referral, windowK_w_m2k } from '../../../core/src/trip/refer.ts';
import { emptyEvidence } from '../../../core/src/trip/windows.ts';
import {
  type FigureUncertainty,
  figureHalfWidth,
  figureUncertainty,
  widened,
} from '../../../core/src/vehicle/figure-uncertainty.ts';

const REFERRAL: Referral = {
  airside: { ...AIRSIDE_DEFAULTS },
  unmeasured_heat_kw: 0,
  ambient_correction_k: 0,
};
const NONE: FigureUncertainty = {
  exponent_half95: { ram: 0, fan: 0 },
  rho2_range: [0.0039, 0.0039],
  aux_range_kw: null,
  ambient_half95_k: 0,
};

function window(speed_kmh: number, fan_pct: number, heat: { meter?: number; balance?: number }, itd_k = 30) {
  const e = emptyEvidence();
  e.speed_kmh.push(speed_kmh);
  e.fan_pct.push(fan_pct);
  e.itd_k.push(itd_k);
  e.meter_kw.push(heat.meter ?? null);
  e.balance_kw.push(heat.balance ?? null);
  e.flow_lpm.push(heat.meter === undefined ? null : 200);
  return e;
}

/** The half-width over the windows that give a k, as learn.ts asks it. */
const halfWidth = (band: 'ram' | 'fan', e: ReturnType<typeof window>, u: FigureUncertainty) =>
  figureHalfWidth(band, e, windowK_w_m2k(band, e, 1, REFERRAL), REFERRAL, u);

describe('uncertainty of the figures a trip k is referred with', () => {
  it('a window at the reference condition is not moved by the exponent', () => {
    const u = { ...NONE, exponent_half95: { ram: 0.2, fan: 0.2 } };
    expect(halfWidth('fan', window(0, 100, { meter: 20 }), u)).toBe(0);
    expect(halfWidth('ram', window(80, 0, { meter: 20 }), u)).toBeCloseTo(0, 12);
  });

  it('the exponent moves a ram window at half the reference speed by its half-width × ln 2', () => {
    const u = { ...NONE, exponent_half95: { ram: 0.2, fan: 0 } };
    expect(halfWidth('ram', window(40, 0, { meter: 20 }), u)).toBeCloseTo(0.2 * Math.log(2), 10);
  });

  it('unmeasured heat moves only heat-balance windows, by ln((balance + aux) / balance) at its worse end', () => {
    const u = { ...NONE, aux_range_kw: [0, 2] as [number, number] };
    expect(halfWidth('ram', window(80, 0, { balance: 10 }), u)).toBeCloseTo(Math.log(1.2), 10);
    expect(halfWidth('ram', window(80, 0, { meter: 10, balance: 10 }), u)).toBe(0);
  });

  it('the ambient correction moves k by its half-width over the ITD', () => {
    const u = { ...NONE, ambient_half95_k: 0.6 };
    expect(halfWidth('ram', window(80, 0, { meter: 20 }, 30), u)).toBeCloseTo(0.02, 10);
  });

  it('the ratio matters in the fan band by how fast the window crawled', () => {
    const u = { ...NONE, rho2_range: [0.001, 0.02] as [number, number] };
    const still = halfWidth('fan', window(0, 100, { meter: 20 }), u);
    const crawl = halfWidth('fan', window(18, 100, { meter: 20 }), u);
    expect(still).toBe(0);
    expect(crawl).toBeGreaterThan(0.02);
  });

  it('widens each side in quadrature (the worked example)', () => {
    const [lo, hi] = widened(2000, [1960, 2040], 0.02);
    expect(lo).toBeCloseTo(1943.9, 1);
    expect(hi).toBeCloseTo(2057.1, 1);
  });

  it('fleet-file figures are taken as given; defaults by their ranges; a borrowed fan exponent by the range', () => {
    const fitted = (value: number, half: number) => ({
      value,
      ci95: [value - half, value + half] as [number, number],
      basis: 'fitted' as const,
    });
    const given = { value: 0.5, ci95: null, basis: 'fleet_file' as const };
    const heat = { value_kw: 0, ci95: null, basis: 'none' as const, trips: 0, reason: 'x' };
    const fromFile = figureUncertainty(
      {
        velocity_exponent: given,
        fan_velocity_exponent: given,
        ram_face_ratio: { ...given, value: 0.25 },
        fan_face_velocity_ms: { ...given, value: 4 },
      },
      heat,
    );
    expect(fromFile.exponent_half95).toEqual({ ram: 0, fan: 0 });
    expect(fromFile.rho2_range[0]).toBe(fromFile.rho2_range[1]);
    expect(fromFile.aux_range_kw).toBeNull();
    const borrowed = figureUncertainty(
      {
        velocity_exponent: fitted(0.55, 0.03),
        fan_velocity_exponent: fitted(0.55, 0.03),
        ram_face_ratio: { value: 0.25, ci95: null, basis: 'default' },
        fan_face_velocity_ms: { value: 4, ci95: null, basis: 'default' },
      },
      { ...heat, ci95: [-0.5, 3] },
    );
    expect(borrowed.exponent_half95.ram).toBeCloseTo(0.03, 12);
    expect(borrowed.exponent_half95.fan).toBe(0.2);
    expect(borrowed.rho2_range[0]).toBeLessThan(0.002);
    expect(borrowed.rho2_range[1]).toBeGreaterThan(0.05);
    expect(borrowed.aux_range_kw).toEqual([0, 3]);
  });
});
