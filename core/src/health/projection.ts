import { fitKernSeaton } from '../stats/kern-seaton.ts';
import { createRng } from '../stats/prng.ts';
import { quantileSorted } from '../stats/quantile.ts';
import { theilSen } from '../stats/theil-sen.ts';
import type { HealthOptions } from './options.ts';
import type { TrendRead } from './trend.ts';

export interface Projection {
  /** Model the date comes from; null when there was nothing to project. */
  method: 'kern-seaton' | 'theil-sen' | null;
  /** %: design-point margin at which the vehicle is due for inspection (the policy's rule, as a margin). */
  threshold_pct: number;
  /** Days (epoch-day scale) when the projected margin crosses the threshold; null when the data cannot tell. */
  cross_day: number | null;
  /** 95 % residual-bootstrap interval; an end is null when resamples say it may not come. */
  interval_days: [number | null, number | null] | null;
  /** Model curve for charts: epoch days and margin %. */
  curve: { day: number[]; margin_pct: number[] };
  /** Why there is no date, in words; null when there is one. */
  reason: string | null;
}

export interface Model {
  /** Margin % predicted at day t. */
  at(t: number): number;
  /** First day the margin falls to `thr`, or +∞ when it levels off above it. */
  cross(thr: number): number;
}

const toU = (m: number) => 100 / (100 + m);
const fromU = (u: number) => 100 / u - 100;

/** Linear drift of the margin (Theil–Sen). */
function fitLine(t: readonly number[], m: readonly number[]): Model {
  const f = theilSen(t, m);
  return {
    at: (x) => f.intercept + f.slope * x,
    cross: (thr) => (f.slope < 0 ? (thr - f.intercept) / f.slope : Number.POSITIVE_INFINITY),
  };
}

/**
 * Asymptotic fouling on u = 1/(1 + margin) ∝ 1/kA, which grows with R_f (1/U = 1/U_clean + R_f):
 * u = c + b·(1 − e^{−(t−t0)/τ}). Null when τ runs to the edge of its range (no levelling off seen).
 */
export function fitAsymptotic(t: readonly number[], m: readonly number[]): Model | null {
  const t0 = t[0]!;
  const span = t[t.length - 1]! - t0;
  const f = fitKernSeaton(
    t.map((x) => x - t0),
    m.map(toU),
    span / 10,
    3 * span,
  );
  if (f.at_bound || !(f.b > 0)) return null;
  return {
    at: (x) => fromU(f.c + f.b * (1 - Math.exp(-(x - t0) / f.tau))),
    cross: (thr) => {
      const need = (toU(thr) - f.c) / f.b;
      if (need <= 0) return t0;
      return need >= 1 ? Number.POSITIVE_INFINITY : t0 - f.tau * Math.log(1 - need);
    },
  };
}

/**
 * When will the design-point margin cross `threshold_pct`? Only when the margin's trend (trend.ts) is
 * falling: Sen's interval for the Theil–Sen slope below 0. Kern–Seaton when it levels off within the data,
 * else the Theil–Sen line. The interval: Sen's slope interval for the line, widened by a residual
 * bootstrap of the Kern–Seaton fit when that is the model. A line's interval covers noise, not the
 * levelling off of asymptotic fouling, so it errs early: the safe side for maintenance.
 */
export function projectMargin(read: TrendRead, threshold_pct: number, o: HealthOptions): Projection {
  const none = (
    reason: string,
    method: Projection['method'] = null,
    curve: Projection['curve'] = { day: [], margin_pct: [] },
  ): Projection => ({
    method,
    threshold_pct,
    cross_day: null,
    interval_days: null,
    curve,
    reason,
  });
  if (read.trend === null) return none(read.reason);
  if (read.trend.word !== 'falling') return none('margin shows no significant downward trend');
  const { day: t, pct: m } = read;
  const ks = fitAsymptotic(t, m);
  const asym = ks !== null;
  const model = ks ?? fitLine(t, m);
  const method = asym ? 'kern-seaton' : 'theil-sen';
  const now = t[t.length - 1]!;
  const point = model.cross(threshold_pct);
  const end = Math.min(
    Number.isFinite(point) ? point + 30 : now + o.projection_max_days,
    now + o.projection_max_days,
  );
  const steps = 60;
  const cd = Array.from({ length: steps + 1 }, (_, i) => t[0]! + ((end - t[0]!) * i) / steps);
  const curve = { day: cd, margin_pct: cd.map(model.at) };
  if (!Number.isFinite(point)) {
    const line = fitLine(t, m).cross(threshold_pct);
    const when = Number.isFinite(line)
      ? `, while the straight trend would cross about ${(line - now).toFixed(0)} days after the last trip`
      : '';
    return none(
      `the levelling-off fit (Kern–Seaton) stays above the threshold${when}: the data cannot tell yet`,
      method,
      curve,
    );
  }
  if (point - now > o.projection_max_days) {
    return none(
      `crossing more than ${o.projection_max_days} days ahead: beyond what the data can tell`,
      method,
      curve,
    );
  }

  const within = (v: number) => (Number.isFinite(v) && v - now <= o.projection_max_days ? v : null);
  // The model choice is uncertain too: with Kern–Seaton, the interval spans the line's as well.
  const sen = senInterval(t, m, threshold_pct);
  const boot = asym ? bootstrapInterval(t, m, model, threshold_pct, o) : sen;
  const lo = Math.min(sen[0], boot[0]);
  const hi = Math.max(sen[1], boot[1]);
  return {
    method,
    threshold_pct,
    cross_day: point,
    interval_days: [within(lo), within(hi)],
    curve,
    reason: null,
  };
}

/**
 * Crossing days for the ends of Sen's slope interval, the line pivoting on its point at the median day:
 * the steeper slope gives the early end, the shallower the late one (+∞ if it does not fall).
 */
function senInterval(t: readonly number[], m: readonly number[], thr: number): [number, number] {
  const f = theilSen(t, m);
  const xm = t[Math.floor(t.length / 2)]!;
  const ym = f.intercept + f.slope * xm;
  const at = (s: number) => (s < 0 ? xm + (thr - ym) / s : Number.POSITIVE_INFINITY);
  return [at(f.slope_ci95![0]), at(f.slope_ci95![1])];
}

/** 95 % residual-bootstrap interval of the Kern–Seaton crossing (refits showing no levelling off use the line). */
function bootstrapInterval(
  t: readonly number[],
  m: readonly number[],
  model: Model,
  thr: number,
  o: HealthOptions,
): [number, number] {
  const fitted = t.map(model.at);
  const resid = m.map((v, i) => v - fitted[i]!);
  const rng = createRng(o.bootstrap_seed);
  const crosses = new Float64Array(o.bootstrap_runs);
  for (let b = 0; b < o.bootstrap_runs; b++) {
    const mb = fitted.map((f) => f + resid[Math.floor(rng.uniform() * resid.length)]!);
    crosses[b] = (fitAsymptotic(t, mb) ?? fitLine(t, mb)).cross(thr);
  }
  crosses.sort();
  return [quantileSorted(crosses, 0.025), quantileSorted(crosses, 0.975)];
}
