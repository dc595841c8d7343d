import type { Band } from '../trip/bands.ts';
import type { BandMonitor } from './band-monitor.ts';
import { DAY_MS } from './band-monitor.ts';
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
  change_points: { signal: string; since: string; detector: 'cusum' | 'ewma' | 'step' }[];
  baselines: { start: string; k_w_m2k: number | null; source: 'bench' | 'trips'; reference: number | null }[];
}

export interface MarginSeries {
  /** The band whose k stands for the design point; only its trips feed the margin level. */
  basis: Band;
  pct: (number | null)[];
  level_pct: (number | null)[];
  lat_c: (number | null)[];
  lat_level_c: (number | null)[];
  inspect_below_pct: number;
  watch_below_pct: number;
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

/** Spreads a band monitor's points over the input order (`inputIndex[timeOrderIndex]`). */
export function bandSeries(m: BandMonitor, inputIndex: readonly number[], cusum_h: number): BandSeries {
  const n = inputIndex.length;
  const col = () => new Array<number | null>(n).fill(null);
  const s: BandSeries = {
    health: col(),
    level: col(),
    ewma: col(),
    ewma_lcl: col(),
    cusum: col(),
    cusum_h,
    change_points: m.changes.map((c) => ({
      signal: isoOfMs(c.signal_ms),
      since: isoOfMs(c.since_ms),
      detector: c.detector,
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
