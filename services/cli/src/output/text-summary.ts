import type { AnalysisReport, VehicleResult } from '@thermargin/shared';

const num = (x: number | null | undefined, unit: string, digits = 1) =>
  x === null || x === undefined ? '—' : `${x >= 0 && unit === '%' ? '+' : ''}${x.toFixed(digits)} ${unit}`;

/** The margin's direction and rate, e.g. "falling 4.1 pts/30 d". */
function trend(v: VehicleResult): string {
  if (!v.trend) return 'trend —';
  const rate = v.trend_pct_per_30d;
  return v.trend === 'steady' || rate === null || rate === undefined
    ? `trend ${v.trend}`
    : `trend ${v.trend} ${Math.abs(rate).toFixed(1)} pts/30 d`;
}

/** When inspection is due: a date ahead, or how long overdue (as of the vehicle's latest trip). */
function due(v: VehicleResult): string {
  const date = v.projected_inspect_date?.slice(0, 10);
  if (!date) return 'inspect by —';
  const late = v.projected_inspect_overdue_days;
  return late === null || late === undefined
    ? `inspect by ${date}`
    : `inspect overdue ${late} d (due ${date})`;
}

/**
 * One line per vehicle: status, cause, the current margin level and its limiting ambient, the margin's
 * trend, when inspection is due; the caution when needed.
 */
export function textSummary(report: AnalysisReport, caution: string): string {
  const lines: string[] = [];
  let recommends = false;
  for (const v of report.vehicles) {
    if (v.unassessed !== undefined) {
      lines.push(`${v.id.padEnd(14)} ${'unassessed'.padEnd(8)} ${v.unassessed}`);
      continue;
    }
    const status = v.status ?? '—';
    if (status === 'inspect' || status === 'watch') recommends = true;
    lines.push(
      [
        v.id.padEnd(14),
        status.padEnd(8),
        `cause ${v.cause ?? '—'}`.padEnd(20),
        `margin ${num(v.margin_pct, '%')}`.padEnd(17),
        `limiting ambient ${num(v.limiting_ambient_c, '°C')}`.padEnd(27),
        trend(v).padEnd(29),
        due(v).padEnd(38),
        `${v.trips.length} trips`,
      ].join(' '),
    );
    if (v.cause_evidence && v.cause && v.cause !== 'none') lines.push(`${''.padEnd(15)}${v.cause_evidence}`);
  }
  lines.push(`rejected samples: ${report.rejected.total}`);
  if (recommends) lines.push('', caution);
  return `${lines.join('\n')}\n`;
}
