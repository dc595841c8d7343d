import type { Trend } from '@thermargin/shared';
import { type TheilSenFit, theilSen } from '../stats/theil-sen.ts';
import { isoOfDay } from './series.ts';

/** Fewest margins, and fewest days they span, for a trend (and so a projection) to be judged. */
const MIN_TRIPS = 8;
const MIN_SPAN_DAYS = 7;
/** trips: longest history a trend or projection is fitted to (keeps the bootstrap cheap). */
export const MAX_TRIPS = 120;

/** The margin's direction since the governing band's last change: the one rate every output quotes. */
export interface MarginTrend {
  /** Falling or rising when Sen's 95 % interval of the slope excludes zero, else steady. */
  word: Trend;
  /** Points of design-point margin per 30 days (Theil–Sen slope), with Sen's 95 % interval. */
  pct_per_30d: number;
  pct_per_30d_ci95: [number, number] | null;
  /** Epoch days of the first and last margin fitted, and how many margins. */
  from_day: number;
  to_day: number;
  trips: number;
}

export type TrendRead =
  | { trend: MarginTrend; fit: TheilSenFit; day: number[]; pct: number[] }
  | { trend: null; reason: string };

/**
 * The trend of the design-point margins given (epoch days ascending, %): the Theil–Sen line over the
 * latest MAX_TRIPS of them (Theil 1950; Sen 1968). The caller passes the margins since the last change
 * point, so a step is never averaged into a slope. Not judged below MIN_TRIPS over MIN_SPAN_DAYS.
 */
export function marginTrend(day: readonly number[], margin_pct: readonly number[]): TrendRead {
  const t = day.slice(-MAX_TRIPS);
  const m = margin_pct.slice(-MAX_TRIPS);
  const span = t.length ? t[t.length - 1]! - t[0]! : 0;
  if (t.length < MIN_TRIPS || span < MIN_SPAN_DAYS) {
    return {
      trend: null,
      reason: `margin trend not judged: ${t.length} trips over ${span.toFixed(0)} days since the last step or re-baseline (needs ${MIN_TRIPS} over ${MIN_SPAN_DAYS})`,
    };
  }
  const fit = theilSen(t, m);
  const ci = fit.slope_ci95;
  const word: Trend = ci && ci[1] < 0 ? 'falling' : ci && ci[0] > 0 ? 'rising' : 'steady';
  return {
    trend: {
      word,
      pct_per_30d: fit.slope * 30,
      pct_per_30d_ci95: ci && [ci[0] * 30, ci[1] * 30],
      from_day: t[0]!,
      to_day: t[t.length - 1]!,
      trips: t.length,
    },
    fit,
    day: t,
    pct: m,
  };
}

/** The trend in words, e.g. "margin falling 4.1 points per 30 days since 2026-07-14 (23 trips)". */
export function trendWords(t: MarginTrend): string {
  const since = isoOfDay(t.from_day)!.slice(0, 10);
  const rate = `${Math.abs(t.pct_per_30d).toFixed(1)} points per 30 days`;
  return t.word === 'steady'
    ? `margin steady since ${since} (${t.trips} trips)`
    : `margin ${t.word} ${rate} since ${since} (${t.trips} trips)`;
}
