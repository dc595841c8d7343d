/**
 * Maximum-likelihood start of a mean shift away from a known in-control mean μ0 (Hinkley 1971,
 * "Inference about the change-point from cumulative sum tests", Biometrika 58): for a normal series
 * with one shift of unknown size after the change, the estimate is the j in [from, x.length) that
 * maximises (Σ_{i≥j} (x_i − μ0))² / (n − j). A CUSUM's "after its last zero" bounds the search from
 * below, so the estimate only moves that start later, towards where the shift really is.
 * Example: x [1, 1, 1, 0, 0], μ0 1, from 0 → 3.
 */
export function shiftStart(x: ArrayLike<number>, mu0: number, from: number): number {
  const n = x.length;
  if (!(from >= 0 && from < n))
    throw new RangeError(`shiftStart: from ${from} outside the series of ${n} points`);
  let best = from;
  let bestScore = Number.NEGATIVE_INFINITY;
  let sum = 0;
  for (let j = n - 1; j >= from; j--) {
    sum += x[j]! - mu0;
    const score = (sum * sum) / (n - j);
    if (score >= bestScore) {
      bestScore = score;
      best = j;
    }
  }
  return best;
}
