import { medianCi95Sorted } from '../stats/median-ci.ts';
import { quantileSorted } from '../stats/quantile.ts';
import type { Band } from './bands.ts';
import type { EstimatorOptions } from './estimator-options.ts';
import type { BandWindows } from './windows.ts';

export interface BandEstimate {
  k_w_m2k: number | null;
  ci95: [number, number] | null;
  n_samples: number;
  windows: number;
  /** Why k is null, in words; null when there is an estimate. */
  reason: string | null;
}

function rejectedWords(w: Pick<BandWindows, 'rejected'>): string {
  const parts: string[] = [];
  if (w.rejected.low_heat) parts.push(`${w.rejected.low_heat} with too little heat`);
  if (w.rejected.not_steady) parts.push(`${w.rejected.not_steady} not near-steady`);
  if (w.rejected.short) parts.push(`${w.rejected.short} too short`);
  return parts.length ? `; windows rejected: ${parts.join(', ')}` : '';
}

/**
 * A band's k for one trip: the median of its windows' k (robust to the odd transient window), with the
 * distribution-free 95 % interval of the median; null with the reason when there are too few windows.
 */
export function estimateBand(
  band: Band,
  w: Pick<BandWindows, 'samples' | 'eligible' | 'rejected'>,
  k_w_m2k: ArrayLike<number>,
  o: EstimatorOptions,
  fullOpen_c: number,
): BandEstimate {
  const valid = Array.from(k_w_m2k).filter((k) => Number.isFinite(k));
  const windows = valid.length;
  if (windows < o.min_windows) {
    const reason =
      w.eligible === 0
        ? `${band} band: never reached with the thermostat fully open (coolant_in ≥ ${fullOpen_c.toFixed(1)} °C) and ITD ≥ ${o.min_itd_k} K`
        : `${band} band: ${windows} valid ${o.window_s}-s windows, need ${o.min_windows}${rejectedWords(w)}`;
    return { k_w_m2k: null, ci95: null, n_samples: w.samples, windows, reason };
  }
  const sorted = Float64Array.from(valid).sort();
  return {
    k_w_m2k: quantileSorted(sorted, 0.5),
    ci95: medianCi95Sorted(sorted),
    n_samples: w.samples,
    windows,
    reason: null,
  };
}
