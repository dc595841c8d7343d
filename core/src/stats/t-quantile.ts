/** 1.959964: the standard normal's 97.5 % quantile. */
const Z975 = 1.959964;

/**
 * Student's t 97.5 % quantile (two-sided 95 %) for `df` degrees of freedom: exact for 1 and 2, else the
 * Cornish–Fisher expansion in 1/df of Abramowitz & Stegun, *Handbook of Mathematical Functions* (1964),
 * 26.7.5, to the fourth term (within 0.2 % of the exact value from df = 3 on).
 * Examples (scipy.stats.t.ppf(0.975, df)): 3 → 3.1824, 4 → 2.7764, 10 → 2.2281, 30 → 2.0423.
 */
export function t975(df: number): number {
  if (!(df >= 1)) throw new RangeError(`t975: df must be ≥ 1, got ${df}`);
  if (df === 1) return Math.tan(Math.PI * 0.475);
  if (df === 2) return 0.95 / Math.sqrt(2 * 0.975 * 0.025);
  const z = Z975;
  const z2 = z * z;
  const g1 = (z * (z2 + 1)) / 4;
  const g2 = (z * ((5 * z2 + 16) * z2 + 3)) / 96;
  const g3 = (z * (((3 * z2 + 19) * z2 + 17) * z2 - 15)) / 384;
  const g4 = (z * ((((79 * z2 + 776) * z2 + 1482) * z2 - 1920) * z2 - 945)) / 92_160;
  return z + g1 / df + g2 / df ** 2 + g3 / df ** 3 + g4 / df ** 4;
}
