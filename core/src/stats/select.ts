/**
 * k-th smallest element (0-based) by Hoare's quickselect (Hoare 1961, "Algorithm 65: FIND"),
 * reordering `a` in place; expected O(n), so trip percentiles need no full sort.
 */
export function selectInPlace(a: Float64Array, k: number, lo = 0, hi = a.length - 1): number {
  if (k < lo || k > hi) throw new RangeError(`selectInPlace: k=${k} outside ${lo}…${hi}`);
  while (hi > lo) {
    const pivot = a[(lo + hi) >>> 1]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i++] = a[j]!;
        a[j--] = t;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k]!;
  }
  return a[k]!;
}

/** Type-7 quantile (as quantileSorted) without sorting; reorders `a`. */
export function quantileInPlace(a: Float64Array, p: number): number {
  const n = a.length;
  if (n === 0) throw new RangeError('quantileInPlace: empty data');
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const x = selectInPlace(a, lo);
  if (lo + 1 >= n || h === lo) return x;
  // After selection every element above index lo is ≥ x: the next order statistic is their minimum.
  let next = Number.POSITIVE_INFINITY;
  for (let i = lo + 1; i < n; i++) if (a[i]! < next) next = a[i]!;
  return x + (h - lo) * (next - x);
}
