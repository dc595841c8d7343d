import type { AnalysisReport, TripResult } from '@thermargin/shared';

/**
 * Trip result columns of the CSV output; intervals are split into _lo/_hi, lists joined with "; ". The
 * margin is the governing band's (margin_source says how), the trip's own figures follow at the end.
 */
const COLUMNS = [
  'trip',
  'start',
  'end',
  'samples',
  'rejected',
  'distance_km',
  'k_ram_w_m2k',
  'k_ram_ci95',
  'n_ram',
  'k_fan_w_m2k',
  'k_fan_ci95',
  'n_fan',
  'heat_kw_mean',
  'heat_kw_p95',
  'heat_kw_max',
  'heat_kwh',
  'derate_s',
  'coolant_max_c',
  'ambient_max_c',
  'margin_pct',
  'limiting_ambient_c',
  'margin_basis',
  'health_ram',
  'health_fan',
  'status',
  'soak_offset_k',
  'fan_saturated_share',
  'coolant_dt_per_kw',
  'k_ram_reason',
  'k_fan_reason',
  'sensor_flags',
  'margin_source',
  'trip_margin_pct',
  'trip_limiting_ambient_c',
  'trip_margin_basis',
  'too_short',
] as const satisfies readonly (keyof TripResult)[];

function cell(v: unknown): string {
  if (v === null || v === undefined) return '';
  const s = Array.isArray(v) ? v.join('; ') : String(v);
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

function header(): string {
  const names = COLUMNS.flatMap((c) => (c.endsWith('_ci95') ? [`${c}_lo`, `${c}_hi`] : [c]));
  return ['vehicle', ...names].join(',');
}

/**
 * One row per trip, vehicle first, after the caution as `#` comment lines (a reader's comment option,
 * e.g. `comment='#'`, skips them).
 */
export function tripsCsv(report: AnalysisReport, caution: string): string {
  const lines = [...caution.split('\n').map((l) => `# ${l}`), header()];
  for (const v of report.vehicles) {
    for (const t of v.trips) {
      const cells = COLUMNS.flatMap((c) => {
        const x = t[c];
        return c.endsWith('_ci95')
          ? [cell((x as number[] | null)?.[0]), cell((x as number[] | null)?.[1])]
          : [cell(x)];
      });
      lines.push([cell(v.id), ...cells].join(','));
    }
  }
  return `${lines.join('\n')}\n`;
}
