import type { TripResult } from '@thermargin/shared';
import { medianCi95Sorted } from '../stats/median-ci.ts';
import { quantileSorted } from '../stats/quantile.ts';
import { type Band, BAND_NAMES } from '../trip/bands.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import type { BandFouling } from './fouling-rate.ts';
import { tripK } from './trip-k.ts';
import { roundTo as r } from '../stats/round.ts';

/** Field k of one band of one vehicle against its bench k. */
export interface BandFieldK {
  band: Band;
  /** Trips with a k in this band. */
  trips: number;
  /** W/(m²·K): median trip k over the whole record (fouled and clean), with its 95 % interval. */
  k_w_m2k: number | null;
  k_ci95: [number, number] | null;
  /** W/(m²·K): the clean k from the fouling fit (fouling-rate.ts), when there is one. */
  k_clean_w_m2k: number | null;
  bench_k_w_m2k: number | null;
  /** –: median field k ÷ bench k, and the interval carried through (bench k taken as exact). */
  ratio: number | null;
  ratio_ci95: [number, number] | null;
  /** –: clean field k ÷ bench k: what the bench rating is worth on the road with a clean core. */
  clean_ratio: number | null;
}

/**
 * Field k per band against the bench: the median of the trips' k (each referred to the band's
 * reference condition, so comparable with a bench point at that condition) with the distribution-free
 * 95 % interval of the median (Conover 1999, stats/median-ci.ts). Sensor-flagged trips are left out.
 */
export function fieldK(
  v: VehicleModel,
  trips: readonly TripResult[],
  fouling: readonly BandFouling[],
): BandFieldK[] {
  return BAND_NAMES.map((band) => {
    const ks = Float64Array.from(
      trips.map((t) => tripK(t, band)).filter((k): k is number => k !== null),
    ).sort();
    const bench = v.bench_k_w_m2k?.[band] ?? null;
    const k = ks.length ? quantileSorted(ks, 0.5) : null;
    const ci = medianCi95Sorted(ks);
    const kClean = fouling.find((f) => f.band === band)?.k_clean_w_m2k ?? null;
    const per = (x: number | null) => (x === null || bench === null ? null : r(x / bench, 4));
    return {
      band,
      trips: ks.length,
      k_w_m2k: k === null ? null : r(k, 1),
      k_ci95: ci ? [r(ci[0], 1), r(ci[1], 1)] : null,
      k_clean_w_m2k: kClean,
      bench_k_w_m2k: bench,
      ratio: per(k),
      ratio_ci95: ci && bench !== null ? [r(ci[0] / bench, 4), r(ci[1] / bench, 4)] : null,
      clean_ratio: per(kClean),
    };
  });
}
