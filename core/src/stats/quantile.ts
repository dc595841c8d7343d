/**
 * Quantile of sorted data by linear interpolation between order statistics (Hyndman & Fan 1996,
 * definition 7; the default of R and numpy, and of simple-statistics ≥ 7.9).
 * Example: quantileSorted([1, 2, 3, 4], 0.25) = 1.75.
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) throw new RangeError('quantileSorted: empty data');
  if (!(p >= 0 && p <= 1)) throw new RangeError(`quantileSorted: p must be within 0…1, got ${p}`);
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const a = sorted[lo]!;
  return lo + 1 < n ? a + (h - lo) * (sorted[lo + 1]! - a) : a;
}

/** Sorted copy as a Float64Array (NaN-free input expected). */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort();
}

export function median(values: ArrayLike<number>): number {
  return quantileSorted(sortedCopy(values), 0.5);
}
