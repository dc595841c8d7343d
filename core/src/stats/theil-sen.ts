import { median, quantileSorted } from './quantile.ts';

/** 1.959964: two-sided 95 % standard-normal quantile. */
const Z95 = 1.959964;

export interface TheilSenFit {
  slope: number;
  /** Conover's convention: median of (y − slope·x), the line through the median residual. */
  intercept: number;
  /** Sen's (1968) distribution-free 95 % interval for the slope; null below 3 points. */
  slope_ci95: [number, number] | null;
}

/**
 * Theil–Sen line (Theil 1950; Sen 1968): slope = median of (y_j − y_i)/(x_j − x_i) over i < j with
 * x_i ≠ x_j. The slope interval takes the order statistics (N ∓ C)/2 of the N pairwise slopes, with
 * C = z·√(n(n−1)(2n+5)/18), the normal approximation to Kendall's S (ties in x ignored).
 * Examples (as scipy.stats.theilslopes gives them): x 1…5, y [1,2,3,4,100] → slope 1, intercept 0;
 * x 0…9, y = 2x + 1 with y[9] = −50 → slope 2, intercept 1.
 */
export function theilSen(x: ArrayLike<number>, y: ArrayLike<number>): TheilSenFit {
  const n = x.length;
  if (n !== y.length) throw new RangeError(`theilSen: x has ${n} values, y has ${y.length}`);
  const all = new Float64Array((n * (n - 1)) / 2);
  let N = 0;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const dx = x[j]! - x[i]!;
      if (dx !== 0) all[N++] = (y[j]! - y[i]!) / dx;
    }
  }
  if (N === 0) throw new RangeError('theilSen: needs at least two distinct x values');
  const slopes = all.subarray(0, N).sort();
  const slope = quantileSorted(slopes, 0.5);
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) resid[i] = y[i]! - slope * x[i]!;
  let ci: [number, number] | null = null;
  if (n >= 3) {
    const C = Z95 * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18);
    const lo = Math.max(0, Math.floor((N - C) / 2));
    const hi = Math.min(N - 1, Math.ceil((N + C) / 2));
    ci = [slopes[lo]!, slopes[hi]!];
  }
  return { slope, intercept: median(resid), slope_ci95: ci };
}
