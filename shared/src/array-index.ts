/**
 * Index arithmetic for windows over time-ordered arrays, so per-trip reads cost their window, not the
 * whole history. Each mirrors the Array method it replaces exactly (including its handling of odd counts).
 */

/**
 * First index ≥ `from` whose value is ≥ x in ascending `a` (a.length when none): with `from` 0,
 * `a.filter(v => v >= x)` starts there.
 */
export function lowerBound(a: ArrayLike<number>, x: number, from = 0): number {
  let lo = from;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Start of `arr.slice(-k)` for an array of length `len`. */
export function tailStart(len: number, k: number): number {
  const rel = Math.trunc(-k) || 0;
  return rel < 0 ? Math.max(len + rel, 0) : Math.min(rel, len);
}

/** End of `arr.slice(0, k)` for an array of length `len`. */
export function headEnd(len: number, k: number): number {
  const rel = Math.trunc(k) || 0;
  return rel < 0 ? Math.max(len + rel, 0) : Math.min(rel, len);
}
