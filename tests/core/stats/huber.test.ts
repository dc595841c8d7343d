import { describe, expect, it } from 'vitest';
import { huberFit, type RobustProblem } from '../../../core/src/stats/huber.ts';
import { LineSums } from '../../../core/src/stats/line-sums.ts';
import { createRng } from '../../../core/src/stats/prng.ts';
import { t975 } from '../../../core/src/stats/t-quantile.ts';

/** Stack loss data (Brownlee 1965): air flow, water temperature, acid concentration → stack loss. */
const STACKLOSS = [
  [80, 27, 89, 42],
  [80, 27, 88, 37],
  [75, 25, 90, 37],
  [62, 24, 87, 28],
  [62, 22, 87, 18],
  [62, 23, 87, 18],
  [62, 24, 93, 19],
  [62, 24, 93, 20],
  [58, 23, 87, 15],
  [58, 18, 80, 14],
  [58, 18, 89, 14],
  [58, 17, 88, 13],
  [58, 18, 82, 11],
  [58, 19, 93, 12],
  [50, 18, 89, 8],
  [50, 18, 86, 7],
  [50, 19, 72, 8],
  [50, 19, 79, 8],
  [50, 20, 80, 9],
  [56, 20, 82, 15],
  [70, 20, 91, 15],
] as const;

/** A linear problem y = level(group) + X·θ + error. */
function linear(
  X: readonly (readonly number[])[],
  y: readonly number[],
  group: ArrayLike<number>,
  cluster: ArrayLike<number>,
): RobustProblem {
  const n = y.length;
  const p = X[0]!.length;
  return {
    n,
    p,
    group: Int32Array.from(group),
    groups: Math.max(...Array.from(group)) + 1,
    cluster: Int32Array.from(cluster),
    clusters: Math.max(...Array.from(cluster)) + 1,
    evaluate(theta, e, J) {
      for (let i = 0; i < n; i++) {
        let f = 0;
        for (let j = 0; j < p; j++) {
          f += X[i]![j]! * theta[j]!;
          J[i * p + j] = -X[i]![j]!;
        }
        e[i] = y[i]! - f;
      }
    },
  };
}

describe('Huber M-estimate with group levels and cluster-robust intervals', () => {
  const X = STACKLOSS.map((r) => [r[0], r[1], r[2]]);
  const y = STACKLOSS.map((r) => r[3]);
  const one = new Array(21).fill(0);
  const own = Array.from({ length: 21 }, (_, i) => i);

  it('stackloss: Huber T (1.345, MAD scale) as statsmodels RLM documents it', () => {
    const f = huberFit(linear(X, y, one, own), [0, 0, 0]);
    // statsmodels.org "Robust Linear Models": params const −41.026498, 0.829384, 0.926066, −0.127847.
    expect(f.converged).toBe(true);
    expect(f.levels[0]).toBeCloseTo(-41.026498, 4);
    expect(f.theta[0]).toBeCloseTo(0.829384, 5);
    expect(f.theta[1]).toBeCloseTo(0.926066, 5);
    expect(f.theta[2]).toBeCloseTo(-0.127847, 5);
  });

  it('least squares with one observation per cluster: White HC0 · n/(n − 1) (COMPUTED with numpy)', () => {
    const f = huberFit(linear(X, y, one, own), [0, 0, 0], { c: 1e12, max_iterations: 5, tolerance: 1e-12 });
    // OLS (R's lm(stack.loss ~ ., stackloss)): 0.7156, 1.2953, −0.1521, intercept −39.9197.
    expect(f.theta[1]).toBeCloseTo(1.29529, 4);
    expect(f.levels[0]).toBeCloseTo(-39.91967, 4);
    const se = [0, 1, 2].map((j) => Math.sqrt(f.cov[j * 3 + j]!));
    expect(se[0]).toBeCloseTo(0.1628694, 6);
    expect(se[1]).toBeCloseTo(0.4575547, 6);
    expect(se[2]).toBeCloseTo(0.08856386, 7);
    expect(f.half95[0]).toBeCloseTo(t975(20) * se[0]!, 12);
  });

  it('a level per group: the slope is the within-group one, whatever the levels', () => {
    const x = [1, 2, 3, 1, 2, 3, 1, 2, 3];
    const g = [0, 0, 0, 1, 1, 1, 2, 2, 2];
    const yy = x.map((v, i) => 0.5 * v + [10, -4, 100][g[i]!]!);
    const f = huberFit(
      linear(
        x.map((v) => [v]),
        yy,
        g,
        g,
      ),
      [0],
    );
    expect(f.theta[0]).toBeCloseTo(0.5, 10);
    expect(Array.from(f.levels)).toEqual([10, -4, 100].map((v) => expect.closeTo(v, 9)));
  });

  it('95 % intervals cover the true slope about 95 % of the time with errors correlated within clusters', () => {
    const rng = createRng(20250715);
    let covered = 0;
    const runs = 400;
    for (let run = 0; run < runs; run++) {
      const X1: number[][] = [];
      const yy: number[] = [];
      const g: number[] = [];
      for (let c = 0; c < 12; c++) {
        let ar = 0;
        const level = 5 * rng.normal();
        for (let i = 0; i < 15; i++) {
          // AR(1) errors with φ 0.7 and a regressor that drifts within the cluster too.
          ar = 0.7 * ar + rng.normal();
          const x = i / 15 + 0.3 * rng.normal();
          X1.push([x]);
          yy.push(level + 2 * x + 0.5 * ar);
          g.push(c);
        }
      }
      const f = huberFit(linear(X1, yy, g, g), [0]);
      if (Math.abs(f.theta[0]! - 2) <= f.half95[0]!) covered++;
    }
    expect(covered / runs).toBeGreaterThan(0.9);
    expect(covered / runs).toBeLessThan(0.99);
  });
});

describe('Student t quantile', () => {
  it('97.5 % points within 0.2 % of scipy.stats.t.ppf(0.975, df)', () => {
    const scipy: Record<number, number> = {
      1: 12.7062,
      2: 4.3027,
      3: 3.1824,
      4: 2.7764,
      10: 2.2281,
      30: 2.0423,
    };
    for (const [df, v] of Object.entries(scipy))
      expect(Math.abs(t975(Number(df)) / v - 1)).toBeLessThan(0.002);
  });
});

describe('least-squares line sums', () => {
  it('(0, 1), (1, 3), (2, 5): slope 2, value at 0 of 1; one point: its value', () => {
    const l = new LineSums();
    for (const [x, y] of [
      [0, 1],
      [1, 3],
      [2, 5],
    ] as const)
      l.add(x, y);
    expect(l.slope()).toBeCloseTo(2, 12);
    expect(l.valueAtZero()).toBeCloseTo(1, 12);
    const one = new LineSums();
    one.add(3, 7);
    expect(one.valueAtZero()).toBe(7);
  });
});
