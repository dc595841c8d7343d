/**
 * Distribution-free confidence interval for the median from order statistics: the ranks
 * n/2 ± z·√n/2 (normal approximation to the binomial; Conover, *Practical Nonparametric Statistics*,
 * 3rd ed. 1999, §3.2, from memory). Needs n ≥ 6 for a 95 % interval to exist inside the data.
 * Example: 1…100, 95 % → [40, 61].
 */
export function medianCi95Sorted(sorted: ArrayLike<number>, z = 1.959964): [number, number] | null {
  const n = sorted.length;
  if (n < 6) return null;
  const half = (z * Math.sqrt(n)) / 2;
  const lo = Math.max(0, Math.floor(n / 2 - half) - 1);
  const hi = Math.min(n - 1, Math.ceil(n / 2 + half));
  return [sorted[lo]!, sorted[hi]!];
}
