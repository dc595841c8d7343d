import type { Alert, Cause } from '@thermargin/shared';
import { CAUSE_WORD } from '@thermargin/shared/results';
import { median } from '../stats/quantile.ts';
import type { Candidate } from './causes.ts';
import type { StatusStep } from './status.ts';

/**
 * The alerts of one vehicle as its trips are walked: one when the status changes, or when a new cause
 * is named while not ok; a warning that an improvement is not credible goes out once, with the next
 * alert or on its own.
 */
export class AlertLog {
  readonly alerts: Alert[] = [];
  /** ISO time the status last entered inspect (the end of that trip); null before. */
  inspectSince: string | null = null;
  private warned = false;
  private alertedCause: Cause = 'none';

  /** `trend`: the margin's trend in words when it moves, read only when an alert goes out. */
  record(
    time: string,
    step: StatusStep,
    c: Candidate,
    warning: string | null,
    trend: () => string | null,
  ): void {
    if (step.status === 'inspect' && step.changed) this.inspectSince = time;
    if (step.changed || (step.status !== 'ok' && c.cause !== 'none' && c.cause !== this.alertedCause)) {
      this.alertedCause = c.cause;
      const because = step.reasons.length ? step.reasons.join('; ') : 'levels back inside the thresholds';
      const moving = trend();
      const detail = `${step.status}: ${because}${c.cause === 'none' ? '' : `; likely ${CAUSE_WORD[c.cause]}: ${c.evidence}`}${moving ? `; ${moving}` : ''}`;
      this.alerts.push({
        time,
        status: step.status,
        cause: c.cause,
        detail: warning ? `${detail}; ${warning}` : detail,
      });
      if (warning) this.warned = true;
    }
    if (warning && !this.warned) {
      this.alerts.push({ time, status: step.status, cause: c.cause, detail: warning });
      this.warned = true;
    }
  }
}

/**
 * A sensor suspect while the margin reads better than after the last re-baseline: say the improvement
 * is not credible (an ambient reading high makes ITD smaller, so k and margin look better).
 * `since`: the first margins since the re-baseline, in time order.
 */
export function improvementWarning(
  since: readonly number[],
  level: number | null,
  N: number,
  deadband: number,
): string | null {
  const first = since.slice(0, N);
  if (level === null || first.length < N) return null;
  const before = median(first);
  if (!(level > before + deadband)) return null;
  return `warning: margin reads ${level.toFixed(1)} % against ${before.toFixed(1)} % earlier, but a sensor is suspect, so the improvement is not credible`;
}
