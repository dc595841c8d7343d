import { quantileSorted, sortedCopy } from './quantile.ts';

/** 1.4826: makes the MAD a consistent estimator of σ for normal data (Hampel 1974). */
export const MAD_TO_SIGMA = 1.4826;

/**
 * Median absolute deviation from the median, unscaled (as simple-statistics `mad`).
 * Example: mad([1, 1, 2, 2, 4, 6, 9]) = 1.
 */
export function mad(values: ArrayLike<number>): number {
  const s = sortedCopy(values);
  const m = quantileSorted(s, 0.5);
  const dev = new Float64Array(s.length);
  for (let i = 0; i < s.length; i++) dev[i] = Math.abs(s[i]! - m);
  return quantileSorted(dev.sort(), 0.5);
}

/** Robust σ estimate: 1.4826 · MAD. */
export function robustSigma(values: ArrayLike<number>): number {
  return MAD_TO_SIGMA * mad(values);
}
