import { createRng } from '@thermargin/core/stats/prng';
import { LogHistogram } from '@thermargin/core/sizing/log-histogram';
import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';

describe('LogHistogram', () => {
  it('has the documented bin count', () => {
    // 0.1…5000 kW at 1 %: ⌈ln(50000)/ln(1.01)⌉ = 1088 bins plus the zero bin and the overflow edge.
    expect(new LogHistogram().weights.length).toBe(2 + Math.ceil(Math.log(50000) / Math.log(1.01)));
  });

  it('reads quantiles within ±0.5 % of simple-statistics 7.12.1 on the same data (equal weights)', () => {
    const rng = createRng(3);
    const xs = Array.from({ length: 20000 }, () => 5 + 200 * rng.uniform() ** 2);
    const h = new LogHistogram();
    for (const x of xs) h.add(x, 1);
    for (const p of [0.01, 0.1, 0.5, 0.9, 0.95, 0.99]) {
      const ref = ss.quantile(xs, p);
      expect(Math.abs(h.quantile(p)! / ref - 1)).toBeLessThan(0.006);
    }
    expect(h.quantile(1)).toBe(Math.max(...xs));
  });

  it('weights by time, counts values below the floor at zero, and merges by adding', () => {
    const a = new LogHistogram();
    a.add(0, 30); // regenerating: 30 s at no heat
    a.add(10, 70);
    expect(a.quantile(0.2)).toBe(0);
    // A point mass reads within its bin: 1 % wide.
    expect(Math.abs(a.quantile(0.5)! / 10 - 1)).toBeLessThan(0.01);
    expect(a.weightAbove(5)).toBeCloseTo(70, 9);
    expect(a.weightAbove(20)).toBe(0);
    const b = new LogHistogram();
    b.add(100, 100);
    a.merge(b);
    expect(a.total).toBe(200);
    expect(Math.abs(a.quantile(0.9)! / 100 - 1)).toBeLessThan(0.01);
    expect(a.weightAbove(50)).toBeCloseTo(100, 9);
  });

  it('says null for an empty histogram and rejects a p outside 0…1', () => {
    const h = new LogHistogram();
    expect(h.quantile(0.5)).toBeNull();
    expect(() => h.quantile(1.5)).toThrow(/p must be within/);
  });
});
