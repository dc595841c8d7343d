import { quantileSorted } from '../stats/quantile.ts';
import { roundTo } from '../stats/round.ts';

/** How one figure spreads across vehicles (type-7 quantiles, stats/quantile.ts). */
export interface Spread {
  vehicles: number;
  min: number;
  p25: number;
  median: number;
  p75: number;
  max: number;
}

const r4 = (x: number) => roundTo(x, 4);

/** Spread of the non-null values, or null when there are none. Example: [1, 2, 3, 4] → p25 1.75, median 2.5. */
export function spreadOf(values: readonly (number | null)[]): Spread | null {
  const xs = Float64Array.from(values.filter((x): x is number => x !== null)).sort();
  if (xs.length === 0) return null;
  return {
    vehicles: xs.length,
    min: r4(xs[0]!),
    p25: r4(quantileSorted(xs, 0.25)),
    median: r4(quantileSorted(xs, 0.5)),
    p75: r4(quantileSorted(xs, 0.75)),
    max: r4(xs.at(-1)!),
  };
}
