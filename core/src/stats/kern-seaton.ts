/**
 * Asymptotic fouling (Kern & Seaton 1959): R_f(t) = R*·(1 − (1 − s)·e^{−t/τ}), deposition minus removal
 * levelling off at R*, from a deposit s·R* at t = 0 (s = 0: clean); t and τ in one unit, and before
 * t = 0 the deposit is the initial one. Example: R* 2e-4 m²K/W, τ 500 h, t 500 h → 1.2642e-4.
 */
export function foulingResistance(t: number, rStar: number, tau: number, initialShare = 0): number {
  if (t <= 0) return rStar * initialShare;
  return rStar * (1 - (1 - initialShare) * Math.exp(-t / tau));
}

export interface KernSeatonFit {
  /** u at t = 0. */
  c: number;
  /** Rise of u from t = 0 to the asymptote (b·(1 − e^{−t/τ})). */
  b: number;
  /** Same unit as t: time constant τ. */
  tau: number;
  /** Residual sum of squares. */
  rss: number;
  /** τ ended at the edge of the searched range: the data show no levelling off (or no curvature). */
  at_bound: boolean;
}

/**
 * Least squares for c, b at a fixed τ (linear in the basis 1, 1 − e^{−t/τ}). `su` is Σu; `g` is scratch
 * of t's length for the basis values, so each is computed once.
 */
function fitAtTau(
  t: ArrayLike<number>,
  u: ArrayLike<number>,
  su: number,
  tau: number,
  g: Float64Array,
): { c: number; b: number; rss: number } {
  const n = t.length;
  let sg = 0;
  let sgg = 0;
  let sgu = 0;
  for (let i = 0; i < n; i++) {
    const gi = 1 - Math.exp(-t[i]! / tau);
    g[i] = gi;
    sg += gi;
    sgg += gi * gi;
    sgu += gi * u[i]!;
  }
  const det = n * sgg - sg * sg;
  const b = det > 0 ? (n * sgu - sg * su) / det : 0;
  const c = (su - b * sg) / n;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const r = u[i]! - c - b * g[i]!;
    rss += r * r;
  }
  return { c, b, rss };
}

/**
 * Fits u(t) = c + b·(1 − e^{−t/τ}) by least squares: τ profiled over a log grid of 48 points in
 * [tauMin, tauMax], then refined by golden-section search between the best point's neighbours.
 * For a radiator, u = 1/k (or 1/(1 + margin)) grows with R_f since 1/U = 1/U_clean + R_f.
 */
export function fitKernSeaton(
  t: ArrayLike<number>,
  u: ArrayLike<number>,
  tauMin: number,
  tauMax: number,
): KernSeatonFit {
  if (t.length !== u.length || t.length < 4) throw new RangeError('fitKernSeaton: needs ≥ 4 paired points');
  if (!(tauMin > 0 && tauMax > tauMin))
    throw new RangeError(`fitKernSeaton: bad τ range ${tauMin}…${tauMax}`);
  const G = 48;
  const grid = Array.from({ length: G }, (_, i) => tauMin * (tauMax / tauMin) ** (i / (G - 1)));
  let su = 0;
  for (let i = 0; i < u.length; i++) su += u[i]!;
  const g = new Float64Array(t.length);
  // The golden-section steps often land exactly on a τ already tried.
  const tried = new Map<number, number>();
  const rssAt = (tau: number) => {
    let r = tried.get(tau);
    if (r === undefined) tried.set(tau, (r = fitAtTau(t, u, su, tau, g).rss));
    return r;
  };
  let best = 0;
  let bestRss = Number.POSITIVE_INFINITY;
  grid.forEach((tau, i) => {
    const r = rssAt(tau);
    if (r < bestRss) [best, bestRss] = [i, r];
  });
  let lo = Math.log(grid[Math.max(0, best - 1)]!);
  let hi = Math.log(grid[Math.min(G - 1, best + 1)]!);
  const phi = (Math.sqrt(5) - 1) / 2;
  for (let it = 0; it < 60 && hi - lo > 1e-10; it++) {
    const a = hi - phi * (hi - lo);
    const b = lo + phi * (hi - lo);
    if (rssAt(Math.exp(a)) < rssAt(Math.exp(b))) hi = b;
    else lo = a;
  }
  const tau = Math.exp((lo + hi) / 2);
  const f = fitAtTau(t, u, su, tau, g);
  return { ...f, tau, at_bound: best === 0 || best === G - 1 };
}
