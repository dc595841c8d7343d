/**
 * One-sided tabular CUSUM for a downward shift (Page 1954; tabular form as in Montgomery, *Introduction
 * to Statistical Quality Control*): S_t = max(0, S_{t−1} + (μ0 − x_t)/σ − k), signal when S_t > h.
 * The change is estimated to have started after the last time S was 0 (Montgomery).
 * Example: k 0.5, h 5 → one-sided in-control ARL 930.9 (integral equation, docs/methods.md §5).
 */
export interface CusumDesign {
  /** σ units: reference value (allowance) k, half the shift to detect. */
  k: number;
  /** σ units: decision interval h. */
  h: number;
}

export interface CusumPoint {
  /** σ units: the statistic S_t. */
  s: number;
  signal: boolean;
  /** Observation count (1-based) after which the shift is estimated to have begun. */
  since: number;
}

export interface Cusum {
  push(x: number): CusumPoint;
}

/** `direction` −1 watches for a fall of x (the default), +1 for a rise; `mu0`, `sigma` read at every step. */
export function createCusum(
  d: CusumDesign,
  mu0: () => number,
  sigma: () => number,
  direction: -1 | 1 = -1,
): Cusum {
  if (!(d.k >= 0 && d.h > 0))
    throw new RangeError(`createCusum: need k ≥ 0 and h > 0, got k ${d.k}, h ${d.h}`);
  let s = 0;
  let t = 0;
  let lastZero = 0;
  return {
    push(x) {
      t++;
      s = Math.max(0, s + (direction * (x - mu0())) / sigma() - d.k);
      if (s === 0) lastZero = t;
      return { s, signal: s > d.h, since: lastZero };
    },
  };
}

/**
 * Siegmund's (1985) approximation of a one-sided CUSUM's ARL for a shift of δ σ:
 * ARL = (e^{−2Δb} + 2Δb − 1) / (2Δ²), Δ = δ − k, b = h + 1.166; b² when Δ = 0.
 * Example: k 0.5, δ 0 → two-sided 169.1 (h 4) and 469.1 (h 5).
 */
export function siegmundArl(d: CusumDesign, delta: number): number {
  const D = delta - d.k;
  const b = d.h + 1.166;
  if (Math.abs(D) < 1e-12) return b * b;
  return (Math.exp(-2 * D * b) + 2 * D * b - 1) / (2 * D * D);
}

/** Two-sided ARL from the two one-sided ones: 1/ARL = 1/ARL⁺ + 1/ARL⁻ (Montgomery). */
export function twoSidedArl(upper: number, lower: number): number {
  return 1 / (1 / upper + 1 / lower);
}
