import type { Cause, Status, TripResult } from '@thermargin/shared';
import type { Band } from '../trip/bands.ts';
import { designBand } from '../trip/design-point.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { AlertLog, improvementWarning } from './alert-log.ts';
import { BandMonitor, type BandSummary } from './band-monitor.ts';
import { type Candidate, fallZ, rankCauses } from './causes.ts';
import { EvidenceTracker } from './cause-evidence.ts';
import { fanStep } from './fan-step.ts';
import { MarginTrack } from './margin-track.ts';
import type { HealthOptions } from './options.ts';
import { rebaselineTimes_ms } from './rebaseline.ts';
import { StatusMachine } from './status.ts';
import { latForMargin_c, type MarginThresholds, marginThresholds } from './thresholds.ts';
import { type TrendRead, marginTrend, trendWords } from './trend.ts';
import { ownMargin, TripMargins } from './trip-margins.ts';

/** Top cause if it scores enough, else none. */
function pickCause(c: readonly Candidate[], min: number): Candidate {
  const top = c.find((x) => x.cause !== 'none' && x.score >= min);
  return top ?? c.find((x) => x.cause === 'none')!;
}

/**
 * One vehicle's trips walked in time order, each judged on itself and the trips before it, as a live
 * system would: per trip, (1) its k goes to the band monitors and its signs to the evidence, (2) the
 * governing band's margin level is read, (3) the causes are ranked, (4) the status steps and (5) the
 * alert log records what changed. What the walk leaves behind is read by assessVehicle.
 */
export class TripWalk {
  readonly bands: Record<Band, BandMonitor>;
  /** The band whose k stands for the design point: only its margins judge the margin level. */
  readonly basis: Band;
  readonly thresholds: MarginThresholds;
  readonly margins = new MarginTrack();
  readonly log = new AlertLog();
  /** Per trip in input order: the margin level after it, its margin from the governing band, and the status. */
  readonly marginLevel: (number | null)[];
  readonly tripMargins: TripMargins;
  readonly statuses: Status[];
  /** Per trip in input order: the cause named after it ('none' while none scores enough). */
  readonly causes: Cause[];
  status: Status = 'ok';
  cause: Candidate;
  candidates: Candidate[] = [];
  /** The improvement-not-credible warning as of the latest trip. */
  warning: string | null = null;
  private readonly machine: StatusMachine;
  private readonly evidence: EvidenceTracker;
  private readonly minDrop: number;

  constructor(
    private readonly vehicle: VehicleModel,
    n: number,
    private readonly o: HealthOptions,
  ) {
    const p = vehicle.policy;
    const bench = vehicle.bench_k_w_m2k;
    this.bands = {
      ram: new BandMonitor('ram', bench?.ram ?? null, rebaselineTimes_ms(vehicle.maintenance, 'ram'), o),
      fan: new BandMonitor('fan', bench?.fan ?? null, rebaselineTimes_ms(vehicle.maintenance, 'fan'), o),
    };
    this.basis = designBand(vehicle);
    this.thresholds = marginThresholds(p, vehicle.coolant_limit_c, vehicle.design.ambient_c);
    this.machine = new StatusMachine(this.thresholds, p);
    this.evidence = new EvidenceTracker(vehicle.maintenance, o);
    this.minDrop = p.watch_health_drop_pct / 100;
    this.marginLevel = new Array<number | null>(n).fill(null);
    this.tripMargins = new TripMargins(n, this.basis, (m) =>
      latForMargin_c(m, vehicle.coolant_limit_c, vehicle.design.ambient_c),
    );
    this.statuses = new Array<Status>(n);
    this.causes = new Array<Cause>(n);
    this.cause = pickCause(
      rankCauses(this.bands.ram.summary(), this.bands.fan.summary(), this.evidence.read(), o, this.minDrop),
      o.cause_min_score,
    );
  }

  /** Takes trip `t` (input index `i`, time-order index `j`, start `ms`). */
  visit(t: TripResult, i: number, j: number, ms: number): void {
    const changes = this.bands[this.basis].changes;
    const known = changes.length;
    this.observe(t, j, ms);
    const ram = this.bands.ram.summary();
    const fan = this.bands.fan.summary();
    const primary = this.basis === 'ram' ? ram : fan;
    const level = this.margins.level(primary, this.o);
    const m = this.margins.judged(level, primary);
    this.marginLevel[i] = m;
    const bandLevel = m ?? this.margins.segmentMedian(primary, this.o);
    this.tripMargins.take(t, i, ms, bandLevel);
    if (changes.length > known) this.tripMargins.changed(changes[changes.length - 1]!.since_ms, bandLevel);
    const c = this.judgeCause(ram, fan);
    const step = this.machine.step({
      margin_pct: m,
      health: [ram.level?.value ?? null, fan.level?.value ?? null],
      ...this.fallen(ram, fan),
      sensor_suspect: c.cause === 'sensor',
      coolant_suspect: c.cause === 'coolant_flow',
      margin_falling: (level?.slope_per_day ?? 0) < 0,
    });
    this.warning =
      c.cause === 'sensor'
        ? improvementWarning(
            this.margins.firstSince(primary.period_start_ms, this.o.baseline_trips),
            m,
            this.o.baseline_trips,
            this.vehicle.policy.hysteresis_margin_pct,
          )
        : null;
    this.log.record(t.end, step, c, this.warning, () => {
      const tr = this.trendRead().trend;
      return tr && tr.word !== 'steady' ? trendWords(tr) : null;
    });
    this.status = step.status;
    this.cause = c;
    this.statuses[i] = step.status;
    this.causes[i] = c.cause;
  }

  /** The trip's k to the band monitors (none from a trip with sensor flags), its signs to the evidence. */
  private observe(t: TripResult, j: number, ms: number): void {
    const flagged = t.sensor_flags.length > 0;
    this.bands.ram.push(j, ms, flagged ? null : t.k_ram_w_m2k);
    this.bands.fan.push(j, ms, flagged ? null : t.k_fan_w_m2k);
    this.evidence.push(t, ms);
    const own = ownMargin(t);
    if (!flagged && own.pct !== null && own.basis === this.basis) this.margins.push(ms, own.pct);
  }

  /**
   * Where the margin's trend and projection start: its latest step since the governing band's
   * re-baseline (MarginTrack.lastStep_ms), so neither is a fit across one.
   */
  trendStart_ms(): number {
    const band = this.bands[this.basis];
    return this.margins.lastStep_ms(
      band.summary().period_start_ms,
      band.periodChanges().map((c) => c.since_ms),
      this.o,
    );
  }

  /** The margin's trend since trendStart_ms, as of the latest trip: the read trend and projection share. */
  trendRead(): TrendRead {
    const since = this.margins.since(this.trendStart_ms());
    return marginTrend(since.day, since.pct);
  }

  private judgeCause(ram: BandSummary, fan: BandSummary): Candidate {
    const { o, bands } = this;
    this.candidates = rankCauses(ram, fan, this.evidence.read(), o, this.minDrop, () =>
      fanStep(bands.fan, bands.ram, fan.reference, ram.reference, o.min_level_trips),
    );
    return pickCause(this.candidates, o.cause_min_score);
  }

  /** A band fell by the watch drop beyond noise, and by the watch drop less the deadband. */
  private fallen(ram: BandSummary, fan: BandSummary) {
    const fell = (drop: number) => [ram, fan].some((b) => b.alarm && (b.drop ?? 0) >= drop && fallZ(b) >= 2);
    return {
      detected_drop: fell(this.minDrop),
      detected_drop_held: fell(this.minDrop - this.vehicle.policy.hysteresis_margin_pct / 100),
    };
  }
}
