/**
 * Largest-triangle-three-buckets downsampling (S. Steinarsson, "Downsampling Time Series for Visual
 * Representation", MSc thesis, University of Iceland, 2013): keeps the first and last point and, from
 * each of `threshold − 2` equal buckets between them, the point forming the largest triangle with the
 * point kept before it and the mean of the next bucket — so peaks and troughs survive.
 * Several series on one time axis: a point's area is summed over the series, each divided by its
 * range, so one index set keeps every series' shape; NaN values add nothing.
 * Example: x = 0…4, y = [0, 0, 5, 0, 0], threshold 3 → indices [0, 2, 4].
 * Returns the chosen indices in ascending order (all of them when threshold ≥ n or < 3).
 */
export function lttbIndices(
  x: ArrayLike<number>,
  ys: readonly ArrayLike<number>[],
  threshold: number,
): Int32Array {
  const n = x.length;
  if (threshold >= n || threshold < 3) return Int32Array.from({ length: n }, (_, i) => i);
  const scale = ys.map((y) => {
    let lo = Number.POSITIVE_INFINITY;
    let hi = Number.NEGATIVE_INFINITY;
    for (let i = 0; i < n; i++) {
      const v = y[i]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    return hi > lo ? 1 / (hi - lo) : 0;
  });
  const out = new Int32Array(threshold);
  const every = (n - 2) / (threshold - 2);
  const avgY = new Float64Array(ys.length);
  let a = 0;
  for (let b = 0; b < threshold - 2; b++) {
    const nextFrom = Math.floor((b + 1) * every) + 1;
    const nextTo = Math.min(Math.floor((b + 2) * every) + 1, n);
    let avgX = 0;
    for (let j = nextFrom; j < nextTo; j++) avgX += x[j]!;
    avgX /= nextTo - nextFrom;
    for (let s = 0; s < ys.length; s++) {
      const y = ys[s]!;
      let sum = 0;
      let m = 0;
      for (let j = nextFrom; j < nextTo; j++) {
        const v = y[j]!;
        if (!Number.isNaN(v)) {
          sum += v;
          m++;
        }
      }
      avgY[s] = m ? sum / m : Number.NaN;
    }
    const from = Math.floor(b * every) + 1;
    const to = Math.floor((b + 1) * every) + 1;
    const xa = x[a]!;
    let best = from;
    let bestArea = -1;
    for (let j = from; j < to; j++) {
      let area = 0;
      for (let s = 0; s < ys.length; s++) {
        const y = ys[s]!;
        const t = Math.abs((xa - avgX) * (y[j]! - y[a]!) - (xa - x[j]!) * (avgY[s]! - y[a]!)) * scale[s]!;
        if (!Number.isNaN(t)) area += t;
      }
      if (area > bestArea) {
        bestArea = area;
        best = j;
      }
    }
    out[b + 1] = best;
    a = best;
  }
  out[threshold - 1] = n - 1;
  return out;
}
