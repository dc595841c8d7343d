import { robustSigma } from './mad.ts';

/**
 * Robust noise σ of a series from its successive differences Δx (already taken, possibly pooled over
 * several stretches): 1.4826·MAD(Δx)/√2 (the successive-difference idea of von Neumann et al. 1941,
 * made robust with the MAD). Differences cancel a slow drift, and a step spoils only one of them, so
 * changes of the level barely reach σ. Example: Δx [1, 2, 3, 4] → MAD 1 → 1.04836.
 */
export function sigmaFromDifferences(diffs: ArrayLike<number>): number {
  if (diffs.length < 2)
    throw new RangeError(`sigmaFromDifferences: needs ≥ 2 differences, got ${diffs.length}`);
  return robustSigma(diffs) / Math.SQRT2;
}
