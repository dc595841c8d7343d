import type { Policy, Status } from '@thermargin/shared';
import type { MarginThresholds } from './thresholds.ts';

const RANK: Record<Status, number> = { ok: 0, watch: 1, inspect: 2 };
const BY_RANK: readonly Status[] = ['ok', 'watch', 'inspect'];

/** What the status is judged on after a trip (levels, not single trips). */
export interface StatusInput {
  /** %: current margin level at the design point; null when not judged. */
  margin_pct: number | null;
  /** Health levels per band (k ÷ baseline); null when not judged. */
  health: readonly (number | null)[];
  /** A detector signals a fall of at least the policy's watch drop. */
  detected_drop: boolean;
  /** The same with the deadband: a fall of at least the watch drop less `hysteresis_margin_pct` points. */
  detected_drop_held: boolean;
  sensor_suspect: boolean;
  /** The radiator's temperature drop per kW has risen: the coolant side is suspect before k shows it. */
  coolant_suspect: boolean;
  /** The margin level falls significantly (Theil–Sen): no stepping down on a falling trend. */
  margin_falling: boolean;
}

export interface StatusStep {
  status: Status;
  changed: boolean;
  /** Why the status is what it is, in words. */
  reasons: string[];
}

/**
 * ok → watch → inspect with hysteresis: a worse state is entered at once; a better one only after the
 * level has cleared the threshold plus its deadband on `trips_to_step_down` consecutive trips, and never
 * while the margin is not judged (right after maintenance, until the data show the result) or while
 * it is falling significantly (noise lifting a falling level over the deadband is not a recovery).
 */
export class StatusMachine {
  private status: Status = 'ok';
  private clearing = 0;

  constructor(
    private readonly t: MarginThresholds,
    private readonly p: Policy,
  ) {}

  step(x: StatusInput): StatusStep {
    const reasons: string[] = [];
    const m = x.margin_pct;
    const hi = this.p.inspect_health_ratio;
    const hh = this.p.hysteresis_margin_pct / 100;
    const worst = Math.min(Number.POSITIVE_INFINITY, ...x.health.filter((h): h is number => h !== null));
    let enter = 0;
    let hold = 0;
    if (m !== null && m < this.t.inspect_enter)
      reasons.push(`${this.t.inspect_rule}: margin ${m.toFixed(1)} %`);
    else if (m !== null && m < this.t.watch_enter)
      reasons.push(`${this.t.watch_rule}: margin ${m.toFixed(1)} %`);
    if (m !== null) {
      enter = m < this.t.inspect_enter ? 2 : m < this.t.watch_enter ? 1 : 0;
      hold = m < this.t.inspect_clear ? 2 : m < this.t.watch_clear ? 1 : 0;
    }
    if (worst < hi)
      reasons.push(
        `k at ${(100 * worst).toFixed(0)} % of its baseline (inspect below ${(100 * hi).toFixed(0)} %)`,
      );
    enter = Math.max(enter, worst < hi ? 2 : 0);
    hold = Math.max(hold, worst < hi + hh ? 2 : 0);
    if (x.detected_drop)
      reasons.push(`a change detector signals k ≥ ${this.p.watch_health_drop_pct} % below its reference`);
    if (x.sensor_suspect) reasons.push('a sensor is suspect');
    if (x.coolant_suspect) reasons.push('the coolant side is suspect');
    const flag = x.sensor_suspect || x.coolant_suspect ? 1 : 0;
    enter = Math.max(enter, flag, x.detected_drop ? 1 : 0);
    hold = Math.max(hold, flag, x.detected_drop_held ? 1 : 0);

    const now = RANK[this.status];
    let next = now;
    if (enter > now) {
      next = enter;
      this.clearing = 0;
    } else if (hold < now && m !== null && !x.margin_falling) {
      if (++this.clearing >= this.p.trips_to_step_down) {
        next = hold;
        this.clearing = 0;
      }
    } else this.clearing = 0;
    const status = BY_RANK[next]!;
    const changed = status !== this.status;
    this.status = status;
    return { status, changed, reasons };
  }
}
