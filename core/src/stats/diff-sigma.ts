import { MAD_TO_SIGMA, robustSigma } from './mad.ts';
import { quantileSorted } from './quantile.ts';

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

/**
 * sigmaFromDifferences over a growing list of differences, kept sorted: each read costs O(n) (the MAD's
 * deviations come out of the sorted list as two sorted runs, merged only up to their median) instead of
 * two sorts, and gives exactly the same value.
 */
export class RunningDiffSigma {
  private readonly sorted: number[] = [];

  get length(): number {
    return this.sorted.length;
  }

  push(d: number): void {
    const s = this.sorted;
    let lo = 0;
    let hi = s.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (s[mid]! <= d) lo = mid + 1;
      else hi = mid;
    }
    s.splice(lo, 0, d);
  }

  sigma(): number {
    const s = this.sorted;
    const n = s.length;
    if (n < 2) throw new RangeError(`sigmaFromDifferences: needs ≥ 2 differences, got ${n}`);
    const m = quantileSorted(s, 0.5);
    // |s[i] − m| falls from the left end towards m and rises from there to the right end.
    let r = 0;
    while (r < n && s[r]! < m) r++;
    let l = r - 1;
    // The median of the deviations as quantileSorted takes it: order statistics lo and lo + 1.
    const h = (n - 1) * 0.5;
    const lo = Math.floor(h);
    let a = 0;
    let b = 0;
    for (let k = 0; k <= lo + 1 && k < n; k++) {
      const dl = l >= 0 ? Math.abs(s[l]! - m) : Number.POSITIVE_INFINITY;
      const dr = r < n ? Math.abs(s[r]! - m) : Number.POSITIVE_INFINITY;
      const d = Math.min(dl, dr);
      if (dl <= dr) l--;
      else r++;
      if (k === lo) a = d;
      else if (k === lo + 1) b = d;
    }
    const mad = lo + 1 < n ? a + (h - lo) * (b - a) : a;
    return (MAD_TO_SIGMA * mad) / Math.SQRT2;
  }
}
