import { quantileInPlace } from './select.ts';
import { t975 } from './t-quantile.ts';

/**
 * A robust (M-)estimation problem with a free level per group: r_i = e_i(θ) − a_g(i), where
 * e_i(θ) = y_i − f_i(θ) and the levels a_g are profiled out. `evaluate` fills e (n) and its Jacobian
 * ∂e/∂θ (n × p, row-major) at θ. A linear model has e = y − X·θ and J = −X.
 */
export interface RobustProblem {
  n: number;
  p: number;
  /** Group of each observation (0 … groups − 1): a level is fitted per group. */
  group: Int32Array;
  groups: number;
  /** Cluster of each observation for the interval (0 … clusters − 1): errors may correlate within one. */
  cluster: Int32Array;
  clusters: number;
  evaluate(theta: Float64Array, e: Float64Array, J: Float64Array): void;
  /** Bounds of each parameter; a step is clipped to them. */
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
}

export const HUBER_DEFAULTS = {
  /** –, 1.345: Huber's tuning constant, 95 % efficiency at the normal (Holland & Welsch 1977). */
  c: 1.345,
  /** Iterations at most, 100. */
  max_iterations: 100,
  /** Relative change of θ and of the scale below which the iteration stops. */
  tolerance: 1e-10,
} as const;

export interface RobustFit {
  theta: Float64Array;
  /** Each group's level (NaN for a group without observations). */
  levels: Float64Array;
  /** Robust scale of the residuals: median |r| / 0.6745 (MAD about zero). */
  scale: number;
  /** Cluster-robust covariance of θ (p × p, row-major); NaN with fewer than two clusters. */
  cov: Float64Array;
  /** 95 % half-width of each parameter: t(clusters − 1) · √cov_jj. */
  half95: Float64Array;
  /** Huber weight of each observation at the end. */
  weight: Float64Array;
  iterations: number;
  converged: boolean;
}

/** 0.6744898: the standard normal's 75 % quantile, so median |r| / 0.6745 estimates σ. */
const Q75 = 0.6744897501960817;

function medianAbs(r: Float64Array): number {
  return quantileInPlace(Float64Array.from(r, Math.abs), 0.5);
}

/** Solves the symmetric p × p system A·x = b in place by Gaussian elimination with partial pivoting. */
function solve(A: Float64Array, b: Float64Array, p: number): Float64Array | null {
  const M = Float64Array.from(A);
  const x = Float64Array.from(b);
  for (let k = 0; k < p; k++) {
    let piv = k;
    for (let i = k + 1; i < p; i++) if (Math.abs(M[i * p + k]!) > Math.abs(M[piv * p + k]!)) piv = i;
    if (!(Math.abs(M[piv * p + k]!) > 1e-300)) return null;
    if (piv !== k) {
      for (let j = 0; j < p; j++) [M[k * p + j], M[piv * p + j]] = [M[piv * p + j]!, M[k * p + j]!];
      [x[k], x[piv]] = [x[piv]!, x[k]!];
    }
    for (let i = k + 1; i < p; i++) {
      const f = M[i * p + k]! / M[k * p + k]!;
      for (let j = k; j < p; j++) M[i * p + j] = M[i * p + j]! - f * M[k * p + j]!;
      x[i] = x[i]! - f * x[k]!;
    }
  }
  for (let k = p - 1; k >= 0; k--) {
    let s = x[k]!;
    for (let j = k + 1; j < p; j++) s -= M[k * p + j]! * x[j]!;
    x[k] = s / M[k * p + k]!;
  }
  return x;
}

function inverse(A: Float64Array, p: number): Float64Array | null {
  const inv = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    const e = new Float64Array(p);
    e[j] = 1;
    const col = solve(A, e, p);
    if (!col) return null;
    for (let i = 0; i < p; i++) inv[i * p + j] = col[i]!;
  }
  return inv;
}

/** Subtracts each group's `w`-weighted mean from x (stride p, column j); returns the means. */
function demean(
  x: Float64Array,
  stride: number,
  col: number,
  w: Float64Array,
  group: Int32Array,
  groups: number,
): Float64Array {
  const sw = new Float64Array(groups);
  const sx = new Float64Array(groups);
  for (let i = 0; i < w.length; i++) {
    sw[group[i]!]! += w[i]!;
    sx[group[i]!]! += w[i]! * x[i * stride + col]!;
  }
  const mean = new Float64Array(groups);
  for (let g = 0; g < groups; g++) mean[g] = sw[g]! > 0 ? sx[g]! / sw[g]! : 0;
  for (let i = 0; i < w.length; i++) x[i * stride + col] = x[i * stride + col]! - mean[group[i]!]!;
  return mean;
}

/**
 * Huber M-estimate (Huber, *Robust Statistics*, 1981) by iteratively reweighted least squares (Holland &
 * Welsch 1977), with Gauss–Newton steps for a model nonlinear in θ and a level per group profiled out
 * (within-group demeaning, the Frisch–Waugh–Lovell theorem). Scale: median |r| / 0.6745, updated each
 * iteration, as statsmodels' RLM does by default. Covariance: the sandwich A⁻¹·B·A⁻¹ of the estimating
 * equations with B summed over clusters (Liang & Zeger 1986), times G/(G − 1); intervals take Student's
 * t with G − 1 degrees of freedom (Cameron & Miller 2015, "A practitioner's guide to cluster-robust
 * inference"). Example (statsmodels RLM documentation, stackloss data of Brownlee 1965, one group):
 * θ = (0.8294, 0.9261, −0.1278) with level −41.0265.
 */
export function huberFit(
  P: RobustProblem,
  theta0: ArrayLike<number>,
  o: { c: number; max_iterations: number; tolerance: number } = HUBER_DEFAULTS,
): RobustFit {
  const { n, p, group, groups } = P;
  const theta = Float64Array.from(theta0);
  const e = new Float64Array(n);
  const J = new Float64Array(n * p);
  const w = new Float64Array(n).fill(1);
  const r = new Float64Array(n);
  let levels: Float64Array = new Float64Array(groups);
  let scale = Number.NaN;
  const clip = (j: number, x: number) =>
    Math.min(P.upper?.[j] ?? Number.POSITIVE_INFINITY, Math.max(P.lower?.[j] ?? Number.NEGATIVE_INFINITY, x));
  const residuals = () => {
    P.evaluate(theta, e, J);
    const er = Float64Array.from(e);
    levels = demean(er, 1, 0, w, group, groups);
    r.set(er);
  };
  const reweight = () => {
    scale = medianAbs(r) / Q75;
    for (let i = 0; i < n; i++) {
      const u = Math.abs(r[i]!) / scale;
      w[i] = scale > 0 && u > o.c ? o.c / u : 1;
    }
  };
  let iterations = 0;
  let converged = false;
  residuals();
  for (; iterations < o.max_iterations; iterations++) {
    // Gauss–Newton step on Σ w·(r + J̃·δ)², J̃ the Jacobian less its weighted group means.
    const Jt = Float64Array.from(J);
    for (let j = 0; j < p; j++) demean(Jt, p, j, w, group, groups);
    const A = new Float64Array(p * p);
    const b = new Float64Array(p);
    for (let i = 0; i < n; i++) {
      const wi = w[i]!;
      for (let j = 0; j < p; j++) {
        const Jij = Jt[i * p + j]!;
        b[j] = b[j]! - wi * Jij * r[i]!;
        for (let k = 0; k <= j; k++) A[j * p + k] = A[j * p + k]! + wi * Jij * Jt[i * p + k]!;
      }
    }
    for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) A[k * p + j] = A[j * p + k]!;
    const delta = p > 0 ? solve(A, b, p) : new Float64Array(0);
    if (!delta) break;
    let moved = 0;
    for (let j = 0; j < p; j++) {
      const next = clip(j, theta[j]! + delta[j]!);
      moved = Math.max(moved, Math.abs(next - theta[j]!) / Math.max(1e-12, Math.abs(theta[j]!)));
      theta[j] = next;
    }
    residuals();
    const before = scale;
    reweight();
    if (moved < o.tolerance && Math.abs(scale - before) <= o.tolerance * scale) {
      converged = true;
      iterations++;
      break;
    }
  }
  return {
    theta,
    levels,
    scale,
    ...sandwich(P, J, r, scale, o.c),
    weight: w,
    iterations,
    converged,
  };
}

/** Cluster-robust covariance of the estimating equations Σ J̃·s·ψ(r/s) = 0 at the solution. */
function sandwich(
  P: RobustProblem,
  J: Float64Array,
  r: Float64Array,
  scale: number,
  c: number,
): { cov: Float64Array; half95: Float64Array } {
  const { n, p, group, groups, cluster, clusters } = P;
  const slope = new Float64Array(n);
  const psi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const u = r[i]! / scale;
    const inside = !(scale > 0) || Math.abs(u) <= c;
    slope[i] = inside ? 1 : 0;
    psi[i] = inside ? r[i]! : Math.sign(u) * c * scale;
  }
  const Jt = Float64Array.from(J);
  for (let j = 0; j < p; j++) demean(Jt, p, j, slope, group, groups);
  const A = new Float64Array(p * p);
  const score = new Float64Array(clusters * p);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < p; j++) {
      const Jij = Jt[i * p + j]!;
      score[cluster[i]! * p + j] = score[cluster[i]! * p + j]! + Jij * psi[i]!;
      for (let k = 0; k < p; k++) A[j * p + k] = A[j * p + k]! + slope[i]! * Jij * Jt[i * p + k]!;
    }
  }
  const cov = new Float64Array(p * p).fill(Number.NaN);
  const half95 = new Float64Array(p).fill(Number.NaN);
  const Ainv = inverse(A, p);
  if (!Ainv || clusters < 2) return { cov, half95 };
  const B = new Float64Array(p * p);
  for (let g = 0; g < clusters; g++)
    for (let j = 0; j < p; j++)
      for (let k = 0; k < p; k++) B[j * p + k] = B[j * p + k]! + score[g * p + j]! * score[g * p + k]!;
  const AB = new Float64Array(p * p);
  for (let i = 0; i < p; i++)
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let k = 0; k < p; k++) s += Ainv[i * p + k]! * B[k * p + j]!;
      AB[i * p + j] = s;
    }
  const f = clusters / (clusters - 1);
  for (let i = 0; i < p; i++)
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let k = 0; k < p; k++) s += AB[i * p + k]! * Ainv[k * p + j]!;
      cov[i * p + j] = f * s;
    }
  const t = t975(clusters - 1);
  for (let j = 0; j < p; j++) half95[j] = t * Math.sqrt(cov[j * p + j]!);
  return { cov, half95 };
}
