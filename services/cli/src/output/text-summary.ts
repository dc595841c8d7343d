import { type AnalysisReport, SAFETY_CAUTION } from '@thermargin/shared';

const num = (x: number | null | undefined, unit: string, digits = 1) =>
  x === null || x === undefined ? '—' : `${x >= 0 && unit === '%' ? '+' : ''}${x.toFixed(digits)} ${unit}`;

/** One line per vehicle: status, cause, margin, limiting ambient, projected date; the caution when needed. */
export function textSummary(report: AnalysisReport): string {
  const lines: string[] = [];
  let recommends = false;
  for (const v of report.vehicles) {
    const last = [...v.trips].reverse().find((t) => t.margin_pct !== null);
    const status = v.status ?? '—';
    if (status === 'inspect' || status === 'watch') recommends = true;
    lines.push(
      [
        v.id.padEnd(14),
        status.padEnd(8),
        `cause ${v.cause ?? '—'}`.padEnd(20),
        `margin ${num(last?.margin_pct, '%')}`.padEnd(17),
        `limiting ambient ${num(last?.limiting_ambient_c, '°C')}`.padEnd(27),
        `inspect by ${v.projected_inspect_date?.slice(0, 10) ?? '—'}`.padEnd(22),
        `${v.trips.length} trips`,
      ].join(' '),
    );
    if (v.cause_evidence && v.cause && v.cause !== 'none') lines.push(`${''.padEnd(15)}${v.cause_evidence}`);
  }
  lines.push(`rejected samples: ${report.rejected.total}`);
  if (recommends) lines.push('', SAFETY_CAUTION);
  return `${lines.join('\n')}\n`;
}
