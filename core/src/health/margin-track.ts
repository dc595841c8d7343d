import { DAY_MS } from '@thermargin/shared/time';
import type { BandSummary } from './band-monitor.ts';
import { currentLevel, type Level } from './level.ts';
import type { HealthOptions } from './options.ts';
import { fitAsymptotic, MAX_TRIPS } from './projection.ts';
import { headEnd, lowerBound, tailStart } from '@thermargin/shared/array-index';

/** trips: fewest since the re-baseline for a Kern–Seaton level. */
const MIN_ASYMPTOTIC_TRIPS = 20;

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
