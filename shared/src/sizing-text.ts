import { CAUSE_WORD, type Cause, type FittedFigure } from './results.ts';
import type { DrivetrainComparisonView, VehicleSizingView } from './sizing-api.ts';

/**
 * The sizing figures' provenance in words, one wording for the HTML report and the dashboard: what
 * the fouling fit left out, where each figure of the drivetrain duty and the air side came from, and
 * how a design check's margins step from the analysed one.
 */

type BandFoulingView = VehicleSizingView['fouling'][number];
type DesignCheckView = NonNullable<VehicleSizingView['design_check']>;

const day = (iso: string | null | undefined) => (iso ? iso.slice(0, 10) : '');
const signed = (x: number) => `${x >= 0 ? '+' : '−'}${Math.abs(x).toFixed(1)} %`;

/** "11 trips from 2026-07-29 (fan fault named)", or null when the fit took every trip. */
export function leftOutWords(f: BandFoulingView): string | null {
  if (!f.left_out_trips || !f.left_out_cause) return null;
  const n = f.left_out_trips;
  return `${n} trip${n === 1 ? '' : 's'} from ${day(f.left_out_from)} left out (${CAUSE_WORD[f.left_out_cause as Cause]} named)`;
}

const DUTY_WORD = { given: 'given', fleet_data: 'fleet data', default: 'default' } as const;

/** Where a learned air-side figure came from: fitted to the vehicle's trips, the fleet file or the default. */
export const BASIS_WORD: Record<FittedFigure['basis'], string> = {
  fitted: 'fitted',
  fleet_file: 'fleet file',
  default: 'default',
};

/** "12 570 kg (fleet data), CdA 0.6 m² (default), …" with where each figure came from. */
export function dutyWords(d: DrivetrainComparisonView): string {
  const s = d.duty_source;
  const src = (k: keyof NonNullable<typeof s>) => (s ? ` (${DUTY_WORD[s[k]]})` : '');
  const u = d.duty;
  return [
    `${Math.round(u.mass_kg).toLocaleString('en-US')} kg${src('mass_kg')}`,
    `CdA ${u.cda_m2.toFixed(2)} m²${src('cda_m2')}`,
    `Crr ${u.crr.toFixed(4)}${src('crr')}`,
    `${u.speed_kmh.toFixed(0)} km/h${src('speed_kmh')}`,
    ...(u.grade_pct ? [`${u.grade_pct} % grade`] : []),
    `${u.ambient_c.toFixed(1)} °C${src('ambient_c')}`,
  ].join(', ');
}

/**
 * The design check's margins as steps from the analysed one, each naming what changes it:
 * "now −26.6 % (inspect, fan fault) → +34.1 % with the clean field k → +30.7 % with a 2.6 % allowance
 * (fouling fit)".
 */
export function marginStepsWords(c: DesignCheckView): string {
  const steps: string[] = [];
  if (c.margin_now_pct !== undefined) {
    const state = c.status_now
      ? ` (${c.status_now}${c.cause_now && c.cause_now !== 'none' ? `, ${CAUSE_WORD[c.cause_now]}` : ''})`
      : '';
    steps.push(c.margin_now_pct === null ? 'now not judged' : `now ${signed(c.margin_now_pct)}${state}`);
  }
  const k = { field_clean: 'the clean field k', field_median: 'the median field k', bench: 'the bench k' }[
    c.k_source
  ];
  if (c.margin_design_k_pct !== undefined && c.margin_design_k_pct !== null)
    steps.push(`${signed(c.margin_design_k_pct)} with ${k}`);
  const src = c.allowance_source === 'fouling_fit' ? 'fouling fit' : 'default';
  if (c.margin_pct !== null)
    steps.push(
      `${signed(c.margin_pct)} with a ${(100 * c.fouling_allowance).toFixed(1)} % allowance (${src}${c.allowance_note ? ': the fit’s was implausible' : ''})`,
    );
  return steps.join(' → ');
}
