import { linearRegression } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { sigmaFromDifferences } from '../../../core/src/stats/diff-sigma.ts';
import { fitKernSeaton, foulingResistance } from '../../../core/src/stats/kern-seaton.ts';
import { createRng } from '../../../core/src/stats/prng.ts';
import { theilSen } from '../../../core/src/stats/theil-sen.ts';

describe('Theil–Sen (Theil 1950; Sen 1968; reference values from scipy.stats.theilslopes)', () => {
  it('x 1…5, y [1,2,3,4,100] → slope 1, intercept 0 (OLS would give 20, −38)', () => {
    const f = theilSen([1, 2, 3, 4, 5], [1, 2, 3, 4, 100]);
    expect(f.slope).toBe(1);
    expect(f.intercept).toBe(0);
    const ols = linearRegression([1, 2, 3, 4, 100].map((y, i) => [i + 1, y]));
    expect(ols.m).toBeCloseTo(20, 12);
    expect(ols.b).toBeCloseTo(-38, 12);
  });
  it('x 0…9, y = 2x + 1 with y[9] = −50 → slope 2, intercept 1 (Conover convention; scipy gives −1)', () => {
    const x = Array.from({ length: 10 }, (_, i) => i);
    const y = x.map((v) => 2 * v + 1);
    y[9] = -50;
    const f = theilSen(x, y);
    expect(f.slope).toBe(2);
    expect(f.intercept).toBe(1);
  });
  it('agrees with simple-statistics linearRegression on clean data', () => {
    const pts = Array.from({ length: 12 }, (_, i) => [i * 0.5, 3 * i * 0.5 - 2] as [number, number]);
    const f = theilSen(
      pts.map((p) => p[0]),
      pts.map((p) => p[1]),
    );
    const ols = linearRegression(pts);
    expect(f.slope).toBeCloseTo(ols.m, 12);
    expect(f.intercept).toBeCloseTo(ols.b, 12);
    expect(f.slope_ci95).toEqual([3, 3]);
  });
  it("Sen's interval covers the true slope and excludes 0 on a noisy trend", () => {
    const rng = createRng(3);
    const x = Array.from({ length: 40 }, (_, i) => i);
    const f = theilSen(
      x,
      x.map((v) => 5 - 0.05 * v + 0.3 * rng.normal()),
    );
    expect(f.slope_ci95![0]).toBeLessThan(-0.05);
    expect(f.slope_ci95![1]).toBeGreaterThan(-0.05);
    expect(f.slope_ci95![1]).toBeLessThan(0);
  });
});

describe('Kern–Seaton asymptotic fouling (Kern & Seaton 1959, Br. Chem. Eng. 4(5); values computed)', () => {
  it('R* 2e-4 m²K/W, τ 500 h: 1.2642e-4, 1.7293e-4, 1.9004e-4 at 500, 1000, 1500 h', () => {
    // The printed values carry 5 digits: half a unit of the last digit is 5e-9.
    expect(Math.abs(foulingResistance(500, 2e-4, 500) - 1.2642e-4)).toBeLessThan(5e-9);
    expect(Math.abs(foulingResistance(1000, 2e-4, 500) - 1.7293e-4)).toBeLessThan(5e-9);
    expect(Math.abs(foulingResistance(1500, 2e-4, 500) - 1.9004e-4)).toBeLessThan(5e-9);
    expect(foulingResistance(500, 2e-4, 500) / 2e-4).toBeCloseTo(0.63212, 5);
  });
  it('from a deposit already there: R*·(1 − (1 − s)·e^{−t/τ}), s·R* at and before t = 0', () => {
    // s 0.5, t = τ: 1 − 0.5·e^{−1} = 0.81606 of R*.
    expect(foulingResistance(500, 2e-4, 500, 0.5) / 2e-4).toBeCloseTo(0.81606, 5);
    expect(foulingResistance(0, 2e-4, 500, 0.5)).toBe(1e-4);
    expect(foulingResistance(-10, 2e-4, 500, 0.5)).toBe(1e-4);
    expect(foulingResistance(-10, 2e-4, 500)).toBe(0);
  });
  it('fit recovers c, b, τ from noise-free data, and flags a straight line as at_bound', () => {
    const t = Array.from({ length: 30 }, (_, i) => i * 4);
    const f = fitKernSeaton(
      t,
      t.map((x) => 1 + 0.3 * (1 - Math.exp(-x / 40))),
      10,
      400,
    );
    expect(f.tau).toBeCloseTo(40, 3);
    expect(f.b).toBeCloseTo(0.3, 6);
    expect(f.c).toBeCloseTo(1, 6);
    expect(f.at_bound).toBe(false);
    const line = fitKernSeaton(
      t,
      t.map((x) => 1 + 0.001 * x),
      10,
      400,
    );
    expect(line.at_bound).toBe(true);
  });
});

describe('noise σ from successive differences', () => {
  it('Δx [1, 2, 3, 4] → 1.4826 · 1 / √2 = 1.04836', () => {
    expect(sigmaFromDifferences([1, 2, 3, 4])).toBeCloseTo(1.04836, 5);
  });
  it('ignores a linear drift and a step (seeded normal data, σ 0.04 within 10 %)', () => {
    const rng = createRng(5);
    const x = Array.from(
      { length: 400 },
      (_, i) => 1 - 0.001 * i + (i > 200 ? -0.3 : 0) + 0.04 * rng.normal(),
    );
    const d = x.slice(1).map((v, i) => v - x[i]!);
    expect(Math.abs(sigmaFromDifferences(d) / 0.04 - 1)).toBeLessThan(0.1);
  });
});

describe('seeded generator', () => {
  it('is reproducible, uniform on [0, 1) and standard normal in mean and variance', () => {
    const a = createRng(1);
    const b = createRng(1);
    expect(a.uniform()).toBe(b.uniform());
    const r = createRng(9);
    const z = Array.from({ length: 20_000 }, () => r.normal());
    const mean = z.reduce((s, v) => s + v, 0) / z.length;
    const varc = z.reduce((s, v) => s + (v - mean) ** 2, 0) / (z.length - 1);
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(varc - 1)).toBeLessThan(0.03);
  });
});
