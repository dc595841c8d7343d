/**
 * EWMA control chart (Roberts 1959; design and run lengths in Lucas & Saccucci 1990, Technometrics
 * 32(1):1–12): z_t = λ·x_t + (1 − λ)·z_{t−1}, z_0 = μ0, limits μ0 ± L·σ·√(λ/(2−λ)·(1 − (1−λ)^{2t})).
 * `asymptotic` drops the (1 − (1−λ)^{2t}) start-up factor, as the published ARL tables do.
 * Example: λ 0.1, L 2.814, asymptotic → two-sided in-control ARL 499.6 (Lucas & Saccucci's table).
 */
export interface EwmaDesign {
  /** –: smoothing weight λ, 0 < λ ≤ 1. */
  lambda: number;
  /** σ units: control-limit width L. */
  L: number;
  /** Use the steady-state limit width from the first observation. */
  asymptotic?: boolean;
}

export interface EwmaPoint {
  z: number;
  lower: number;
  upper: number;
  /** −1 below the lower limit, +1 above the upper, 0 inside. */
  signal: -1 | 0 | 1;
}

export interface Ewma {
  push(x: number): EwmaPoint;
}

/** Half-width of the limits after t observations, in units of σ. Example: λ 0.2, L 3, t → ∞: 1.0. */
export function ewmaHalfWidth(d: EwmaDesign, t: number): number {
  const steady = d.lambda / (2 - d.lambda);
  const startup = d.asymptotic ? 1 : 1 - (1 - d.lambda) ** (2 * t);
  return d.L * Math.sqrt(steady * startup);
}

/** `mu0` and `sigma` are read at every step, so a self-starting chart can refine them. */
export function createEwma(d: EwmaDesign, mu0: () => number, sigma: () => number): Ewma {
  if (!(d.lambda > 0 && d.lambda <= 1))
    throw new RangeError(`createEwma: lambda must be in (0, 1], got ${d.lambda}`);
  if (!(d.L > 0)) throw new RangeError(`createEwma: L must be > 0, got ${d.L}`);
  let z = mu0();
  let t = 0;
  return {
    push(x) {
      t++;
      z = d.lambda * x + (1 - d.lambda) * z;
      const w = ewmaHalfWidth(d, t) * sigma();
      const lower = mu0() - w;
      const upper = mu0() + w;
      return { z, lower, upper, signal: z < lower ? -1 : z > upper ? 1 : 0 };
    },
  };
}
