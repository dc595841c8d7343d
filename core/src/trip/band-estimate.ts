import { medianCi95Sorted } from '../stats/median-ci.ts';
import { quantileSorted } from '../stats/quantile.ts';
import type { Band } from './bands.ts';
import type { EstimatorOptions } from './estimator-options.ts';
import { thermostatHint } from './thermostat-hint.ts';
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
 * The median of a band's window k (robust to the odd transient window) and the distribution-free 95 %
 * interval of the median; null with fewer than min_windows finite values. NaN windows are left out.
 */
export function medianK(
  k_w_m2k: ArrayLike<number>,
  o: Pick<EstimatorOptions, 'min_windows'>,
): { k_w_m2k: number; ci95: [number, number] | null; windows: number } | null {
  const sorted = Float64Array.from(Array.from(k_w_m2k).filter((k) => Number.isFinite(k))).sort();
  if (sorted.length < o.min_windows || sorted.length === 0) return null;
  return { k_w_m2k: quantileSorted(sorted, 0.5), ci95: medianCi95Sorted(sorted), windows: sorted.length };
}

/**
 * 95 % interval of a median of `windows` window values whose ln scatters by σ (the vehicle's window
 * scatter): k·exp(±1.96·se), se = σ/√n for n ≤ 2 (the median is the mean) and 1.2533·σ/√n beyond (the
 * median's large-sample efficiency at the normal, √(π/2)). For the few-window trips the order-statistic
 * interval does not cover. Example: k 2000, 1 window, σ 0.02 → [1921.6, 2081.6].
 */
export function scatterCi95(k_w_m2k: number, windows: number, sigma_log: number): [number, number] {
  const se = ((windows <= 2 ? 1 : Math.sqrt(Math.PI / 2)) * sigma_log) / Math.sqrt(windows);
  return [k_w_m2k * Math.exp(-1.959964 * se), k_w_m2k * Math.exp(1.959964 * se)];
}

/**
 * A band's k for one trip: the median of its windows' k (robust to the odd transient window), with the
 * distribution-free 95 % interval of the median; null with the reason when there are too few windows.
 */
export function estimateBand(
  band: Band,
  w: Pick<BandWindows, 'samples' | 'eligible' | 'rejected' | 'held_c'>,
  k_w_m2k: ArrayLike<number>,
  o: EstimatorOptions,
  fullOpen_c: number,
): BandEstimate {
  const m = medianK(k_w_m2k, o);
  if (m === null) {
    const windows = Array.from(k_w_m2k).filter((k) => Number.isFinite(k)).length;
    const hint = w.eligible === 0 ? thermostatHint(w.held_c, fullOpen_c) : null;
    const reason =
      w.eligible === 0
        ? `${band} band: never reached with the thermostat fully open (coolant_in ≥ ${fullOpen_c.toFixed(1)} °C) and ITD ≥ ${o.min_itd_k} K${hint ? `; ${hint}` : ''}`
        : `${band} band: ${windows} valid ${o.window_s}-s windows, need ${o.min_windows}${rejectedWords(w)}`;
    return { k_w_m2k: null, ci95: null, n_samples: w.samples, windows, reason };
  }
  return { ...m, n_samples: w.samples, reason: null };
}
