import type { Trend } from '@thermargin/shared/results';
import type { Status } from '@thermargin/shared/results';
import { dueWords, rateWords, STATUS_WORD, TREND_WORD } from '../format.ts';

/** Each status has a shape of its own as well as a colour and a word: a disc, a notched triangle, a diamond with a bar, a dashed ring. */
function Shape({ status }: { status: Status | 'unassessed' }) {
  switch (status) {
    case 'ok':
      return <circle cx="8" cy="8" r="5.5" />;
    case 'watch':
      return <path d="M8 1.5 L14.5 13.5 H1.5 Z M8 10.2 a1.3 1.3 0 1 0 0.01 0 Z" fill-rule="evenodd" />;
    case 'inspect':
      return (
        <path
          d="M8 0.8 L15.2 8 L8 15.2 L0.8 8 Z M7 4 H9 V9.5 H7 Z M7 10.8 H9 V12.6 H7 Z"
          fill-rule="evenodd"
        />
      );
    default:
      return (
        <circle
          cx="8"
          cy="8"
          r="5"
          fill="none"
          stroke="currentColor"
          stroke-width="1.6"
          stroke-dasharray="2.4 2"
        />
      );
  }
}

export function StatusMark({ status, compact = false }: { status: Status | null; compact?: boolean }) {
  const s = status ?? 'unassessed';
  return (
    <span class={`status status-${s}`} data-status={s}>
      <svg viewBox="0 0 16 16" width="16" height="16" aria-hidden="true" fill="currentColor">
        <Shape status={s} />
      </svg>
      {compact ? <span class="sr-only">{STATUS_WORD[s]}</span> : <span>{STATUS_WORD[s]}</span>}
    </span>
  );
}

const ARROW: Record<Trend, string> = {
  falling: 'M2 4 L8 12 L14 4',
  steady: 'M2 8 H14 M10 4 L14 8 L10 12',
  rising: 'M2 12 L8 4 L14 12',
};

/** The margin's direction: an arrow and its word, and its rate when it moves (the one the finding quotes). */
export function TrendMark({ trend, rate }: { trend: Trend | null; rate?: number | null }) {
  if (!trend) return <span class="muted">too few trips</span>;
  return (
    <span class={`trend trend-${trend}`}>
      <svg
        viewBox="0 0 16 16"
        width="14"
        height="14"
        aria-hidden="true"
        fill="none"
        stroke="currentColor"
        stroke-width="2"
      >
        <path d={ARROW[trend]} />
      </svg>
      {TREND_WORD[trend]}
      {trend !== 'steady' && rate !== null && rate !== undefined && (
        <span class="small muted"> {rateWords(rate)}</span>
      )}
    </span>
  );
}

/** When inspection is due: the date ahead, or how long overdue (in the status colour) with the date. */
export function DueMark({ date, overdue }: { date: string | null; overdue?: number | null | undefined }) {
  const d = dueWords(date, overdue);
  if (!d.late) return <span>{d.due}</span>;
  return (
    <span class="due-late">
      <strong class="bad">{d.late}</strong> <span class="small muted">due {d.due}</span>
    </span>
  );
}
