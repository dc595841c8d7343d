import type { Powertrain } from '@thermargin/shared/fleet';
import {
  CAUSE_WORD,
  type Cause,
  type MarginSource,
  type Status,
  type Trend,
} from '@thermargin/shared/results';
import type { RejectReason } from '@thermargin/shared/telemetry';

export { CAUSE_WORD };
export { bytesText } from '@thermargin/shared/bytes';

/** Words for the contract's codes: a status always reads as a word, never as a colour alone. */
export const STATUS_WORD: Record<Status | 'unassessed', string> = {
  ok: 'OK',
  watch: 'Watch',
  inspect: 'Inspect',
  unassessed: 'Unassessed',
};
export const POWERTRAIN_WORD: Record<Powertrain, string> = {
  ice: 'combustion',
  bev: 'battery-electric',
  fcev: 'fuel cell',
};
/** The two operating bands in one wording on every screen. */
export const BAND_WORD = { ram: 'ram air', fan: 'fan at standstill' } as const;
export const TREND_WORD: Record<Trend, string> = { falling: 'falling', steady: 'steady', rising: 'rising' };
export const ACTION_WORD = {
  radiator_cleaned: 'radiator cleaned',
  fan_repaired: 'fan repaired',
  coolant_serviced: 'coolant serviced',
  sensor_replaced: 'sensor replaced',
} as const;

/** The ingester's refusal codes in words. */
const REFUSAL_WORD: Record<RejectReason, string> = {
  json: 'not JSON',
  schema: 'wrong shape',
  range: 'out of range',
  time_past: 'time too old',
  time_future: 'time ahead',
  unknown_vehicle: 'unknown vehicle',
  vehicle_mismatch: 'vehicle ≠ topic',
  topic: 'not a vehicle topic',
  oversize: 'too large',
  frame_layout: 'CAN frames unreadable',
  dlc_mismatch: 'frame length wrong for its PGN',
  clock_back: 'logger clock went back',
  broker_login: 'broker: wrong login',
  broker_denied: 'broker: topic not allowed',
};
/** Signals as the screening's words name them. */
const SIGNAL_WORD: Record<string, string> = {
  speed_kmh: 'speed',
  power_kw: 'power',
  coolant_in_c: 'radiator inlet temperature',
  coolant_out_c: 'radiator outlet temperature',
  ambient_c: 'ambient temperature',
  fan_pct: 'fan duty',
  coolant_flow_lpm: 'coolant flow',
  derate: 'derate flag',
};
const signalWord = (name: string) => SIGNAL_WORD[name] ?? name.replaceAll('_', ' ');

/** The screening's codes (core/src/trip/clean.ts) in words. */
function screeningWord(code: string): string {
  if (code === 'time_invalid') return 'time unreadable';
  if (code === 'time_before_2000') return 'time before 2000';
  if (code === 'duplicate_time') return 'same time twice';
  const spike = /^spike_(.+)$/.exec(code);
  if (spike) return `${signalWord(spike[1]!)} spike`;
  const fault = /^(.+)_(missing|out_of_range)$/.exec(code);
  if (fault) return `${signalWord(fault[1]!)} ${fault[2] === 'missing' ? 'missing' : 'out of range'}`;
  return code.replaceAll('_', ' ');
}

/** A refusal code in words: the ingester's, else the screening's. */
export const refusalWord = (code: string): string =>
  REFUSAL_WORD[code as RejectReason] ?? screeningWord(code);

/**
 * A vehicle's or alert's cause in words. No cause named reads "no fault found" while all is well,
 * but under watch or inspect the margin is short for a reason not yet seen: it reads so.
 */
export function causeWord(cause: Cause | null | undefined, status: Status | null | undefined): string {
  if (!cause) return DASH;
  return cause === 'none' && (status === 'watch' || status === 'inspect')
    ? 'cause not named yet'
    : CAUSE_WORD[cause];
}

/** Urgency rank: inspect first, unassessed last. */
export const STATUS_RANK: Record<Status | 'unassessed', number> = {
  inspect: 0,
  watch: 1,
  ok: 2,
  unassessed: 3,
};

const DASH = '—';

/** A number with its unit ("−4.5 %", "38.0 °C"); a dash for a missing value. */
export function num(v: number | null | undefined, unit: string, digits = 1): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return DASH;
  const text = v.toFixed(digits).replace('-', '−');
  return unit ? `${text} ${unit}` : text;
}

/** "2026-07-27 10:34 UTC" (the API's times are UTC; the depot reads one clock). */
export function when(iso: string | null | undefined, withTime = true): string {
  if (!iso) return DASH;
  const ms = Date.parse(iso);
  if (!Number.isFinite(ms)) return DASH;
  const s = new Date(ms).toISOString();
  return withTime ? `${s.slice(0, 10)} ${s.slice(11, 16)} UTC` : s.slice(0, 10);
}

/**
 * When inspection is due, in words: the date while it lies ahead; once it has passed, how long overdue
 * ("overdue 10 d", "overdue since today") with the date beside it.
 */
export function dueWords(
  date: string | null | undefined,
  overdue_days: number | null | undefined,
): { due: string; late: string | null } {
  const due = when(date, false);
  if (overdue_days === null || overdue_days === undefined || !date) return { due, late: null };
  return { due, late: overdue_days === 0 ? 'overdue since today' : `overdue ${overdue_days} d` };
}

/**
 * Where a trip's margin comes from, in words: its own k in the band governing the design point, that
 * band's level (the trip gave it no k), or the other band's k through the air-side model.
 */
export function marginSourceWords(t: {
  margin_source?: MarginSource | null | undefined;
  margin_basis: 'ram' | 'fan' | null;
}): string | null {
  switch (t.margin_source) {
    case 'band_level':
      return `${t.margin_basis} band level: no ${t.margin_basis}-band k on this trip`;
    case 'other_band':
      return `from this trip's ${t.margin_basis}-band k through the air-side model (the governing band has no level yet)`;
    default:
      return null;
  }
}

/** The margin's rate in points per 30 days ("−4.1 pts/30 d"). */
export const rateWords = (pct_per_30d: number | null | undefined): string =>
  `${num(pct_per_30d, 'pts')}/30 d`;

/** "3 h ago" relative to the server's `now`. */
export function ago(iso: string | null | undefined, now_ms: number): string {
  if (!iso) return 'never';
  const s = Math.max(0, (now_ms - Date.parse(iso)) / 1000);
  if (s < 90) return `${Math.round(s)} s ago`;
  if (s < 5400) return `${Math.round(s / 60)} min ago`;
  if (s < 172_800) return `${Math.round(s / 3600)} h ago`;
  return `${Math.round(s / 86_400)} d ago`;
}

/** h:mm:ss of a duration in seconds. */
export function duration(s: number): string {
  const t = Math.round(s);
  const h = Math.floor(t / 3600);
  const m = Math.floor((t % 3600) / 60);
  return `${h}:${String(m).padStart(2, '0')}:${String(t % 60).padStart(2, '0')}`;
}

/** What to look at first for each cause (common practice), shown beside the safety caution. */
export const RECOMMENDATION: Record<Cause, string> = {
  fouling:
    'Inspect the radiator core on the air side and clean it; look for debris, bent fins and blocked grilles.',
  fan: 'Check the fan: its drive or motor, wiring and fuses, and that the commanded duty reaches the fan.',
  coolant_flow:
    'Check the coolant level, the pump and the thermostat; look for air in the loop and kinked hoses.',
  sensor: 'Check the coolant and ambient temperature sensors and their wiring before any cooling work.',
  none: 'Review the recent trips; no single cause stands out. Inspect the cooling package as a whole.',
};
