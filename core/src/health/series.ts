import type { MarginSource, Trend } from '@thermargin/shared';
import { DAY_MS } from '@thermargin/shared/time';
import type { Band } from '../trip/bands.ts';
import type { BandMonitor } from './band-monitor.ts';
import { median } from '../stats/quantile.ts';
import type { HealthOptions } from './options.ts';
import type { Projection } from './projection.ts';

/** One band for charts: per trip (input order), null where the trip had no k in the band. */
export interface BandSeries {
  health: (number | null)[];
  /** Current level after each trip (health units). */
  level: (number | null)[];
  ewma: (number | null)[];
  ewma_lcl: (number | null)[];
  /** σ units; the decision interval is `cusum_h`. */
  cusum: (number | null)[];
  cusum_h: number;
  /**
   * `shift_pct`: the band's level at the end of the change's segment (the next change, re-baseline or
   * the latest trip) less the median health of the trips before the change began, in points of health.
   */
  change_points: {
    signal: string;
    since: string;
    detector: 'cusum' | 'ewma' | 'step';
    shift_pct: number | null;
  }[];
  baselines: { start: string; k_w_m2k: number | null; source: 'bench' | 'trips'; reference: number | null }[];
}

export interface MarginSeries {
  /** The band whose k stands for the design point; only its trips feed the margin level. */
  basis: Band;
  /** Each trip's margin from the governing band, and where it comes from (trip-margins.ts). */
  pct: (number | null)[];
  source: (MarginSource | null)[];
  level_pct: (number | null)[];
  lat_c: (number | null)[];
  lat_level_c: (number | null)[];
  inspect_below_pct: number;
  watch_below_pct: number;
  /** The margin's trend since the governing band's last change (trend.ts); null when not judged. */
  trend: {
    word: Trend;
    pct_per_30d: number;
    pct_per_30d_ci95: [number, number] | null;
    since: string;
    trips: number;
  } | null;
}

export interface ProjectionSeries {
  method: Projection['method'];
  threshold_pct: number;
  date: string | null;
  interval: [string | null, string | null] | null;
  curve: { time_ms: number[]; margin_pct: number[]; lat_c: number[] };
  reason: string | null;
}

/** Columnar chart data: `time_ms` is each trip's start, in the input order. */
export interface HealthSeries {
  time_ms: number[];
  ram: BandSeries;
  fan: BandSeries;
  margin: MarginSeries;
  projection: ProjectionSeries;
}

export const isoOfMs = (ms: number) => new Date(ms).toISOString();
export const isoOfDay = (d: number | null) => (d === null ? null : isoOfMs(Math.round(d * DAY_MS)));

/**
 * Level at the end of change j's segment less the median health of the `window` trips before the
 * change began (its estimated start, which the signal can follow by many trips), in points.
 */
function changeShift(m: BandMonitor, j: number, window: number): number | null {
  const c = m.changes[j]!;
  const ends = [m.changes[j + 1]?.signal_ms, ...m.baselines.map((b) => b.start_ms)].filter(
    (t): t is number => t !== undefined && t > c.signal_ms,
  );
  const end = Math.min(Number.POSITIVE_INFINITY, ...ends);
  const start = Math.max(
    Number.NEGATIVE_INFINITY,
    ...m.baselines.map((b) => b.start_ms).filter((t) => t <= c.since_ms),
  );
  const before: number[] = [];
  let after: number | null = null;
  for (const p of m.points) {
    if (p.t_ms >= start && p.t_ms < c.since_ms && p.health !== null) before.push(p.health);
    if (p.t_ms >= c.signal_ms && p.t_ms < end && p.level !== null) after = p.level;
  }
  if (!before.length || after === null) return null;
  return (after - median(before.slice(-window))) * 100;
}

/** Spreads a band monitor's points over the input order (`inputIndex[timeOrderIndex]`). */
export function bandSeries(
  m: BandMonitor,
  inputIndex: readonly number[],
  o: Pick<HealthOptions, 'cusum_h' | 'level_window_trips'>,
): BandSeries {
  const n = inputIndex.length;
  const col = () => new Array<number | null>(n).fill(null);
  const s: BandSeries = {
    health: col(),
    level: col(),
    ewma: col(),
    ewma_lcl: col(),
    cusum: col(),
    cusum_h: o.cusum_h,
    change_points: m.changes.map((c, j) => ({
      signal: isoOfMs(c.signal_ms),
      since: isoOfMs(c.since_ms),
      detector: c.detector,
      shift_pct: changeShift(m, j, o.level_window_trips),
    })),
    baselines: m.baselines.map((b) => ({
      start: isoOfMs(b.start_ms),
      k_w_m2k: b.k_w_m2k,
      source: b.source,
      reference: b.reference,
    })),
  };
  for (const p of m.points) {
    const i = inputIndex[p.trip]!;
    s.health[i] = p.health;
    s.level[i] = p.level;
    s.ewma[i] = p.ewma;
    s.ewma_lcl[i] = p.lcl;
    s.cusum[i] = p.cusum;
  }
  return s;
}
