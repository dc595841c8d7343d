/**
 * Heat-exchanger effectiveness ε = Q / Q_max from NTU = UA / C_min and C = C_min / C_max.
 * Closed forms from Incropera & DeWitt, *Fundamentals of Heat and Mass Transfer*, Table 11.3, and
 * Kays & London, *Compact Heat Exchangers*; the exact unmixed/unmixed crossflow series is Mason's
 * (as given by Kays & London). For C = 0 every arrangement gives ε = 1 − e^(−NTU).
 */

export type FlowArrangement =
  | 'counterflow'
  | 'parallel'
  /** Both fluids unmixed, the usual approximate closed form (within 0.011 of the series for NTU ≤ 5). */
  | 'crossflow_unmixed'
  /** Both fluids unmixed, exact series. */
  | 'crossflow_unmixed_series'
  | 'crossflow_cmax_mixed'
  | 'crossflow_cmin_mixed';

/** Below this, C is treated as 0 and 1 − C as 0 (the closed forms divide by C or by 1 − C). */
const C_EPS = 1e-12;
/** The series stops once a term adds less than this share of the sum. */
const SERIES_TOL = 1e-15;

/**
 * Mason / Kays & London: ε = (1/(C·N)) Σ_{n≥0} P(n, N) · P(n, C·N), with P(n, x) = 1 − e^(−x) Σ_{m≤n} x^m/m!
 * the Poisson upper tail. Poisson terms are stepped in logs so e^(−N) cannot underflow at large NTU.
 */
function crossflowUnmixedSeries(ntu: number, c: number): number {
  const y = c * ntu;
  let logTermN = -ntu; // ln(e^(−N)·N^n/n!)
  let logTermY = -y;
  let cdfN = 0;
  let cdfY = 0;
  let sum = 0;
  for (let n = 0; ; n++) {
    cdfN += Math.exp(logTermN);
    cdfY += Math.exp(logTermY);
    const add = Math.max(0, 1 - cdfN) * Math.max(0, 1 - cdfY);
    sum += add;
    if (n > ntu && add <= SERIES_TOL * sum) return Math.min(1, sum / y); // rounding can pass 1 at huge NTU
    logTermN += Math.log(ntu / (n + 1));
    logTermY += Math.log(y / (n + 1));
  }
}

/**
 * –: effectiveness for an arrangement, `ntu` ≥ 0 and `c_ratio` within 0…1 (Incropera & DeWitt
 * Table 11.3). Throws RangeError outside those. Example: counterflow, NTU 1, C 0.5 → 0.5647.
 */
export function effectiveness(arrangement: FlowArrangement, ntu: number, c_ratio: number): number {
  if (!(ntu >= 0 && ntu < Number.POSITIVE_INFINITY)) {
    throw new RangeError(`effectiveness: ntu must be finite and ≥ 0, got ${ntu}`);
  }
  if (!(c_ratio >= 0 && c_ratio <= 1))
    throw new RangeError(`effectiveness: c_ratio must be within 0…1, got ${c_ratio}`);
  const n = ntu;
  const c = c_ratio;
  if (n === 0) return 0;
  if (c < C_EPS) return -Math.expm1(-n);
  switch (arrangement) {
    case 'counterflow': {
      if (1 - c < C_EPS) return n / (1 + n);
      const e = Math.exp(-n * (1 - c));
      return (1 - e) / (1 - c * e);
    }
    case 'parallel':
      return -Math.expm1(-n * (1 + c)) / (1 + c);
    case 'crossflow_unmixed':
      return -Math.expm1((n ** 0.22 * Math.expm1(-c * n ** 0.78)) / c);
    case 'crossflow_unmixed_series':
      return crossflowUnmixedSeries(n, c);
    case 'crossflow_cmax_mixed':
      return -Math.expm1(c * Math.expm1(-n)) / c;
    case 'crossflow_cmin_mixed':
      return -Math.expm1(Math.expm1(-c * n) / c);
  }
}
