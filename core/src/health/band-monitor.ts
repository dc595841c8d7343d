import { DAY_MS } from '@thermargin/shared/time';
import { median } from '../stats/quantile.ts';
import { shiftStart } from '../stats/change-point.ts';
import { createCusum, type Cusum } from '../stats/cusum.ts';
import { RunningDiffSigma } from '../stats/diff-sigma.ts';
import { createEwma, type Ewma } from '../stats/ewma.ts';
import type { Band } from '../trip/bands.ts';
import { currentLevel, type Level } from './level.ts';
import { lowerBound } from '@thermargin/shared/array-index';
import type { HealthOptions } from './options.ts';

/** One valid trip of a band. */
export interface BandPoint {
  /** Index of the trip in time order. */
  trip: number;
  t_ms: number;
  k_w_m2k: number;
  /** k ÷ baseline k; filled for the baseline trips once the baseline exists. */
  health: number | null;
  ewma: number | null;
  lcl: number | null;
  cusum: number | null;
  /** Current level after this trip (health units), null while not judged. */
  level: number | null;
}

export interface BaselinePeriod {
  band: Band;
  start_ms: number;
  /** W/(m²·K): the health denominator; null while the first trips are still being collected. */
  k_w_m2k: number | null;
  source: 'bench' | 'trips';
  /** Health units: the change detectors' in-control level (median health of the in-control trips so far). */
  reference: number | null;
}

export interface ChangePoint {
  band: Band;
  /** Trip (time order) at which the detectors signalled, and the first trip of the estimated change. */
  signal_trip: number;
  signal_ms: number;
  since_trip: number;
  since_ms: number;
  /** 'step': the step chart that watches for a further sudden fall after a change. */
  detector: 'cusum' | 'ewma' | 'step';
  /** Health units: the band's level just before the change was found (null when not judged yet). */
  level_before: number | null;
}

/** What the rest of the assessment reads from a band after each trip. */
export interface BandSummary {
  band: Band;
  valid_trips: number;
  reference: number | null;
  level: Level | null;
  /** Health units: trip noise σ (robust, from successive differences). */
  sigma: number;
  /** EWMA or CUSUM signalling a fall now. */
  alarm: boolean;
  /** Fraction the level sits below the reference (negative when above). */
  drop: number | null;
  /** Epoch ms from which the current level is estimated (period start or last change). */
  segment_start_ms: number;
  period_start_ms: number;
  /** Epoch ms of the band's latest valid trip; null before the first. */
  last_ms: number | null;
}

interface Period {
  start_ms: number;
  record: BaselinePeriod;
  points: BandPoint[];
  ewma: Ewma | null;
  cusum: Cusum | null;
  /** After a change, a CUSUM tuned to large steps on the new segment's level, and the point it starts at. */
  step: Cusum | null;
  stepFrom: number;
  segmentFrom: number;
  alarmOn: boolean;
  /** Trips since the charts last signalled (a new change needs `rearm_trips` of them). */
  quietTrips: number;
  /** Health of the in-control trips the reference is the median of (self-starting, until the first signal). */
  inControl: number[];
  changesAtStart: number;
  /** Points before this index have their health (health is filled in time order). */
  withHealth: number;
}

/**
 * Follows one band trip by trip, using only the trips seen so far (so delays measured on it are real):
 * baseline, health index, lower EWMA and CUSUM on the health, change points and the current level.
 */
export class BandMonitor {
  readonly points: BandPoint[] = [];
  /** Epoch ms of `points`, for searches by time. */
  private readonly times: number[] = [];
  readonly baselines: BaselinePeriod[] = [];
  readonly changes: ChangePoint[] = [];
  private readonly diffs = new RunningDiffSigma();
  private period: Period | null = null;
  private next = 0;
  private sigmaNow: number;
  private level: Level | null = null;

  constructor(
    readonly band: Band,
    private readonly bench_k: number | null,
    private readonly rebaselines_ms: readonly number[],
    private readonly o: HealthOptions,
  ) {
    this.sigmaNow = o.sigma_floor;
  }

  private openPeriod(start_ms: number): Period {
    const record: BaselinePeriod = {
      band: this.band,
      start_ms,
      k_w_m2k: this.bench_k,
      source: this.bench_k === null ? 'trips' : 'bench',
      reference: null,
    };
    this.baselines.push(record);
    this.level = null;
    return {
      start_ms,
      record,
      points: [],
      ewma: null,
      cusum: null,
      step: null,
      stepFrom: 0,
      segmentFrom: 0,
      alarmOn: false,
      quietTrips: this.o.rearm_trips,
      inControl: [],
      changesAtStart: this.changes.length,
      withHealth: 0,
    };
  }

  /** Advances to the trip at `t_ms`; `k` null when the trip gave this band no usable k. */
  push(trip: number, t_ms: number, k: number | null): void {
    let p = this.period ?? (this.period = this.openPeriod(t_ms));
    while (this.next < this.rebaselines_ms.length && t_ms >= this.rebaselines_ms[this.next]!) {
      p = this.period = this.openPeriod(this.rebaselines_ms[this.next++]!);
    }
    if (k === null) return;
    const pt: BandPoint = {
      trip,
      t_ms,
      k_w_m2k: k,
      health: null,
      ewma: null,
      lcl: null,
      cusum: null,
      level: null,
    };
    p.points.push(pt);
    this.points.push(pt);
    this.times.push(t_ms);
    const N = this.o.baseline_trips;
    if (p.record.k_w_m2k === null && p.points.length === N)
      p.record.k_w_m2k = median(p.points.map((q) => q.k_w_m2k));
    const base = p.record.k_w_m2k;
    if (base === null) return;
    while (p.withHealth < p.points.length) this.addHealth(p, p.withHealth++, base);
    if (p.record.reference === null) {
      if (p.points.length < N) {
        this.updateLevel(p);
        return;
      }
      p.inControl = p.points.map((q) => q.health!);
      p.record.reference = median(p.inControl);
      const sigma = () => this.sigmaNow;
      const ref = () => p.record.reference!;
      p.ewma = createEwma({ lambda: this.o.ewma_lambda, L: this.o.ewma_L }, ref, sigma);
      p.cusum = createCusum({ k: this.o.cusum_k, h: this.o.cusum_h }, ref, sigma);
      this.updateLevel(p);
      return;
    }
    const e = p.ewma!.push(pt.health!);
    const c = p.cusum!.push(pt.health!);
    pt.ewma = e.z;
    pt.lcl = e.lower;
    pt.cusum = c.s;
    const alarm = e.signal === -1 || c.signal;
    // A signal after only a short lapse is the last change going on (a statistic hovering at its
    // limit), not a new one: no new change point, and the step chart keeps watching.
    if (alarm && !p.alarmOn && p.quietTrips >= this.o.rearm_trips) {
      const charted = p.points.length - N; // observations the charts have seen
      // The CUSUM's last zero can lie long before a sudden step when S wandered below h beforehand;
      // Hinkley's estimate inside that stretch finds the step itself, so the level is not diluted.
      const lastZero = N + (c.signal ? c.since : Math.max(0, charted - this.o.level_window_trips));
      this.change(p, p.record.reference!, lastZero, c.signal ? 'cusum' : 'ewma');
    } else if (alarm && p.step && p.points.length - 1 - p.segmentFrom >= this.o.min_level_trips) {
      // The charts stay out of control after a change (on a fouled core, say), so a further fall, such
      // as a fan failing, is found by the step chart against the new segment's level.
      const s = p.step.push(pt.health!);
      if (s.signal) this.change(p, this.level!.value, p.stepFrom + s.since, 'step');
    } else if (alarm && p.step) p.stepFrom = p.points.length; // too soon for a level: start with the next trip
    p.quietTrips = alarm ? 0 : p.quietTrips + 1;
    if (p.quietTrips >= this.o.rearm_trips) p.step = null;
    p.alarmOn = alarm;
    if (!alarm && this.changes.length === p.changesAtStart && p.inControl.length < this.o.reference_trips) {
      p.inControl.push(pt.health!);
      p.record.reference = median(p.inControl);
    }
    this.updateLevel(p);
  }

  /**
   * Records a change whose shift (from `mu0`) began at or after point `from` (Hinkley's estimate),
   * starts the current segment there and restarts the step chart on it.
   */
  private change(p: Period, mu0: number, from: number, detector: ChangePoint['detector']): void {
    const at = shiftStart(
      p.points.map((q) => q.health!),
      mu0,
      Math.min(from, p.points.length - 1),
    );
    const first = p.points[at]!;
    const last = p.points[p.points.length - 1]!;
    this.changes.push({
      band: this.band,
      signal_trip: last.trip,
      signal_ms: last.t_ms,
      since_trip: first.trip,
      since_ms: first.t_ms,
      detector,
      level_before: this.level?.value ?? null,
    });
    p.segmentFrom = Math.max(p.segmentFrom, at);
    // Its reference is the segment's level before each trip (the level is updated after the push).
    p.step = createCusum(
      { k: this.o.step_k, h: this.o.step_h },
      () => this.level!.value,
      () => this.sigmaNow,
    );
    p.stepFrom = p.points.length;
  }

  private addHealth(p: Period, i: number, base: number): void {
    const q = p.points[i]!;
    const h = q.k_w_m2k / base;
    q.health = h;
    const prev = i > 0 ? p.points[i - 1]!.health : null;
    if (prev !== null) this.diffs.push(h - prev);
    if (this.diffs.length >= 4) this.sigmaNow = Math.max(this.o.sigma_floor, this.diffs.sigma());
  }

  private updateLevel(p: Period): void {
    const from = Math.max(p.segmentFrom, p.points.length - this.o.level_window_trips);
    const seg = p.points.slice(from).filter((q) => q.health !== null);
    if (seg.length < this.o.min_level_trips) return;
    this.level = currentLevel(
      seg.map((q) => q.t_ms / DAY_MS),
      seg.map((q) => q.health!),
    );
    p.points[p.points.length - 1]!.level = this.level.value;
  }

  /** Median health of the band's trips from `t_ms` on; null with fewer than `min` of them. */
  healthSince(t_ms: number, min: number): number | null {
    const from = lowerBound(this.times, t_ms);
    const h = this.points.slice(from).map((q) => q.health);
    return h.length >= min && h.every((x) => x !== null) ? median(h as number[]) : null;
  }

  /** The changes found since the current baseline period began, oldest first. */
  periodChanges(): readonly ChangePoint[] {
    return this.period ? this.changes.slice(this.period.changesAtStart) : [];
  }

  /** The band's level as it was after its last trip before `t_ms` (null when none was judged by then). */
  levelBefore(t_ms: number): number | null {
    for (let i = lowerBound(this.times, t_ms) - 1; i >= 0; i--) {
      const l = this.points[i]!.level;
      if (l !== null) return l;
    }
    return null;
  }

  summary(): BandSummary {
    const p = this.period;
    const ref = p?.record.reference ?? null;
    const level = this.level;
    return {
      band: this.band,
      valid_trips: this.points.length,
      reference: ref,
      level,
      sigma: this.sigmaNow,
      alarm: p?.alarmOn ?? false,
      drop: level && ref !== null ? (ref - level.value) / ref : null,
      segment_start_ms: p ? (p.segmentFrom > 0 ? p.points[p.segmentFrom]!.t_ms : p.start_ms) : 0,
      period_start_ms: p?.start_ms ?? 0,
      last_ms: this.points[this.points.length - 1]?.t_ms ?? null,
    };
  }
}
