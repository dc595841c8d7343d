import { medianCi95Sorted } from '../stats/median-ci.ts';
import { quantileSorted } from '../stats/quantile.ts';
import { roundTo } from '../stats/round.ts';

/** Rules for a confirmed ambient offset; defaults defined once here, each says why. */
export const AMBIENT_OFFSET_DEFAULTS = {
  /** cold starts, 6: soak checks needed, the fewest whose median has a 95 % order-statistic interval. */
  min_checks: 6,
  /** K, 1.5 and –, 0.75 (our choice): the offset is steady when this share of the checks lies within
   *  this distance of their median; a sensor that drifts or steps is the health module's finding. */
  steady_within_k: 1.5,
  steady_share: 0.75,
  /** K, 0.3 (our choice): a smaller offset is left alone; it moves k by under 1 % at an ITD of 30 K,
   *  and soak checks themselves scatter by about that much. */
  min_offset_k: 0.3,
} as const;

export interface AmbientOffset {
  /** K: median of the soak checks (coolant_in − ambient at key-on after a long stop); null without checks. */
  value_k: number | null;
  ci95: [number, number] | null;
  checks: number;
  /** Whether the offset is confirmed and corrected for: enough checks, steady, interval excluding zero. */
  applied: boolean;
  /** Why not applied, in words; null when applied. */
  reason: string | null;
}

/**
 * A steady offset between the coolant and ambient sensors from key-on soak checks (common practice: after a
 * long soak the coolant reads ambient within a couple of kelvin). A soaked loop reads ambient, so the
 * median check is the offset of the ITD whichever sensor carries it: correcting the ambient by it
 * (ambient + offset) gives the ITD k, margin and limiting ambient need. Confirmed when there are
 * min_checks checks, they are steady, the median's distribution-free 95 % interval excludes zero and
 * the offset is at least min_offset_k.
 * Example: checks [−1.1, −0.9, −1.0, −1.2, −0.8, −1.0] → −1.0 K, applied.
 */
export function ambientOffset(
  checks_k: readonly number[],
  o: typeof AMBIENT_OFFSET_DEFAULTS = AMBIENT_OFFSET_DEFAULTS,
): AmbientOffset {
  const n = checks_k.length;
  if (n === 0) return { value_k: null, ci95: null, checks: 0, applied: false, reason: 'no soak checks' };
  const sorted = Float64Array.from(checks_k).sort();
  const value = quantileSorted(sorted, 0.5);
  const ci = medianCi95Sorted(sorted);
  const out = {
    value_k: roundTo(value, 2),
    ci95: ci ? ([roundTo(ci[0], 2), roundTo(ci[1], 2)] as [number, number]) : null,
    checks: n,
  };
  const steady = checks_k.filter((x) => Math.abs(x - value) <= o.steady_within_k).length / n;
  const reason =
    n < o.min_checks
      ? `${n} soak checks, need ${o.min_checks}`
      : steady < o.steady_share
        ? `soak checks not steady: ${Math.round(steady * 100)} % within ${o.steady_within_k} K of their median`
        : ci && ci[0] <= 0 && ci[1] >= 0
          ? 'the 95 % interval of the offset includes zero'
          : Math.abs(value) < o.min_offset_k
            ? `below ${o.min_offset_k} K`
            : null;
  return { ...out, applied: reason === null, reason };
}
