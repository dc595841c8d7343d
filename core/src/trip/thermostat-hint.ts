import { quantileSorted } from '../stats/quantile.ts';

/** Rules of the thermostat hint; defaults defined once here (our choices, each says why). */
export const THERMOSTAT_HINT_DEFAULTS = {
  /** samples, 100: as many band samples as entitle a trip to a k. */
  min_samples: 100,
  /** K, 4: a loop held this tightly (10th to 90th percentile) is being regulated, by the thermostat or
   *  the fan: a wax element holds the coolant within a few kelvin (from memory). */
  max_spread_k: 4,
} as const;

/**
 * Words for a band that never counted because the coolant never reached the fleet file's full-open
 * temperature, while the loop, warm and in the band, was held at a steady temperature below it: the
 * fleet file's figure may be wrong, and the value the data show is suggested. Null when the data show
 * no such hold. `held_c`: coolant_in of the band's warm samples (≥ thermostat_open_c, ITD ≥ the
 * minimum) below full open. Example: 120 samples of 86–89 °C, full open 95 °C → "… held at 87.5 °C …
 * thermostat_full_open_c ≈ 89 …".
 */
export function thermostatHint(
  held_c: readonly number[],
  fullOpen_c: number,
  o: typeof THERMOSTAT_HINT_DEFAULTS = THERMOSTAT_HINT_DEFAULTS,
): string | null {
  if (held_c.length < o.min_samples) return null;
  const s = Float64Array.from(held_c).sort();
  const p10 = quantileSorted(s, 0.1);
  const p50 = quantileSorted(s, 0.5);
  const p90 = quantileSorted(s, 0.9);
  if (p90 - p10 > o.max_spread_k) return null;
  return (
    `the loop was held at ${p50.toFixed(1)} °C (80 % of ${s.length} band samples within ${p10.toFixed(1)}–${p90.toFixed(1)} °C), ` +
    `below the fleet file's full-open ${fullOpen_c.toFixed(1)} °C: if the thermostat is fully open there, ` +
    `thermostat_full_open_c ≈ ${Math.ceil(p90)} would let this band count`
  );
}
