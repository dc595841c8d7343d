import { DAY_MS } from '@thermargin/shared/time';
import { headEnd, lowerBound, tailStart } from '@thermargin/shared/array-index';
import { shiftStart } from '../stats/change-point.ts';
import { createCusum } from '../stats/cusum.ts';
import { sigmaFromDifferences } from '../stats/diff-sigma.ts';
import { median } from '../stats/quantile.ts';
import type { BandSummary } from './band-monitor.ts';
import { currentLevel, type Level } from './level.ts';
import type { HealthOptions } from './options.ts';
import { fitAsymptotic } from './projection.ts';
import { MAX_TRIPS } from './trend.ts';

/** trips: fewest since the re-baseline for a Kern–Seaton level. */
const MIN_ASYMPTOTIC_TRIPS = 20;
/** trips, 8: margins each side of a detected change whose medians tell a step from a drift. */
const STEP_TRIPS = 8;
/** 1.2533 = √(π/2): standard error of a median of normal data, in σ/√n. */
const MEDIAN_SE = 1.2533;
/** –, 3: standard errors the margin must jump by across a detected change for it to count as a step. */
const STEP_Z = 3;

/**
 * The design-point margins of the band that governs the design point, as the trips come (time order),
 * and the levels read from them: the margin level is judged on these trips only, so the other band's
 * air-side referral never moves it.
 */
export class MarginTrack {
  /** Epoch ms (ascending) and % of each margin. */
  readonly ms: number[] = [];
  readonly pct: number[] = [];
  private asymptoticKey = '';
  private asymptoticKept: number | null = null;

  push(t_ms: number, margin_pct: number): void {
    this.ms.push(t_ms);
    this.pct.push(margin_pct);
  }

  get count(): number {
    return this.ms.length;
  }

  /** Index of the first margin at or after `t_ms`. */
  from(t_ms: number): number {
    return lowerBound(this.ms, t_ms);
  }

  /**
   * The current level over the governing band's segment (since its last change or re-baseline, at most
   * `level_window_trips`): a line while the band's detectors say it moves; null with too few trips.
   */
  level(primary: BandSummary, o: HealthOptions): Level | null {
    const from = this.from(primary.segment_start_ms);
    const segFrom = from + tailStart(this.count - from, o.level_window_trips);
    if (this.count - segFrom < o.min_level_trips) return null;
    return currentLevel(
      this.ms.slice(segFrom).map((v) => v / DAY_MS),
      this.pct.slice(segFrom),
      primary.alarm,
    );
  }

  /**
   * The median of the segment's latest margins: the band's level while too few for `level` (right
   * after a change); null when the segment has none.
   */
  segmentMedian(primary: BandSummary, o: HealthOptions): number | null {
    const from = this.from(primary.segment_start_ms);
    const segFrom = from + tailStart(this.count - from, o.level_window_trips);
    return segFrom < this.count ? median(this.pct.slice(segFrom)) : null;
  }

  /**
   * The margin level that judges the status: while the detectors say the margin moves, the Kern–Seaton
   * level since the re-baseline when it levels off, else the windowed level.
   */
  judged(level: Level | null, primary: BandSummary): number | null {
    if (level && primary.alarm) return this.asymptotic(primary.period_start_ms) ?? level.value;
    return level?.value ?? null;
  }

  /**
   * The level from the Kern–Seaton fit since `from_ms` (all of that history, where a windowed line has
   * only its last trips); null when the fit shows no levelling off or the history is short. A trip that
   * adds no margin asks for the same fit again, which is kept.
   */
  private asymptotic(from_ms: number): number | null {
    const since = this.from(from_ms);
    const from = since + tailStart(this.count - since, MAX_TRIPS);
    const key = `${from}:${this.count}`;
    if (key === this.asymptoticKey) return this.asymptoticKept;
    this.asymptoticKey = key;
    this.asymptoticKept = null;
    if (this.count - from < MIN_ASYMPTOTIC_TRIPS) return null;
    const t = this.ms.slice(from).map((x) => x / DAY_MS);
    const fit = fitAsymptotic(t, this.pct.slice(from));
    this.asymptoticKept = fit ? fit.at(t[t.length - 1]!) : null;
    return this.asymptoticKept;
  }

  /**
   * Where the margin's latest step begins (epoch ms), at or after `from_ms` (the re-baseline); `from_ms`
   * when it has not stepped. Falls come from the governing band's detectors (`changes_ms`): a fan
   * failing or a coolant-side loss steps, while on fouling, which drifts, a detector's change point
   * only marks when the drift became clear; so a fall counts as a step when the medians of STEP_TRIPS
   * margins either side differ by more than STEP_Z standard errors (σ from the successive differences
   * since `from_ms`), or when too few margins follow it yet (the safe side for a fit that must not span
   * one). Rises, which those one-sided detectors do not look for (a sensor starting to read high), come
   * from an upward CUSUM on the margins (the band's design, k and h), its reference the median of the
   * first `baseline_trips` margins after the latest step, the start by Hinkley's estimate.
   */
  lastStep_ms(from_ms: number, changes_ms: readonly number[], o: HealthOptions): number {
    const start = this.from(from_ms);
    if (this.count - start < 3) return from_ms;
    const diffs = this.pct.slice(start + 1).map((v, k) => v - this.pct[start + k]!);
    const sigma = diffs.length >= 2 ? sigmaFromDifferences(diffs) : 0;
    const se = MEDIAN_SE * sigma * Math.sqrt(2 / STEP_TRIPS);
    const jump = (k: number) =>
      median(this.pct.slice(k, k + STEP_TRIPS)) - median(this.pct.slice(Math.max(start, k - STEP_TRIPS), k));
    let best = from_ms;
    for (const c of changes_ms) {
      const at = this.from(c);
      if (c <= best || at < start) continue;
      if (this.count - at < STEP_TRIPS || at - start < 3 || Math.abs(jump(at)) > STEP_Z * se) best = c;
    }
    if (!(sigma > 0)) return best;
    for (let at = this.from(best); at + o.baseline_trips < this.count; ) {
      const ref = median(this.pct.slice(at, at + o.baseline_trips));
      const up = createCusum(
        { k: o.cusum_k, h: o.cusum_h },
        () => ref,
        () => sigma,
        1,
      );
      const first = at + o.baseline_trips;
      let rose: number | null = null;
      for (let i = first; i < this.count && rose === null; i++) {
        const p = up.push(this.pct[i]!);
        if (p.signal) rose = shiftStart(this.pct.slice(0, i + 1), ref, first + p.since);
      }
      if (rose === null) break;
      best = this.ms[rose]!;
      at = rose;
    }
    return best;
  }

  /** The first `n` margins at or after `from_ms`. */
  firstSince(from_ms: number, n: number): number[] {
    const since = this.from(from_ms);
    return this.pct.slice(since, since + headEnd(this.count - since, n));
  }

  /** Epoch days and margins at or after `from_ms`. */
  since(from_ms: number): { day: number[]; pct: number[] } {
    const since = this.from(from_ms);
    return { day: this.ms.slice(since).map((v) => v / DAY_MS), pct: this.pct.slice(since) };
  }
}
