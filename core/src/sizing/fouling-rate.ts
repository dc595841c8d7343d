import { DAY_MS } from '@thermargin/shared/time';
import type { Cause, TripResult } from '@thermargin/shared';
import { rebaselineTimes_ms } from '../health/rebaseline.ts';
import { marginPct } from '../radiator/rating.ts';
import { median } from '../stats/quantile.ts';
import { theilSen } from '../stats/theil-sen.ts';
import { type Band, BAND_NAMES } from '../trip/bands.ts';
import { designKa_w_k } from '../trip/design-point.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import type { SizingOptions } from './options.ts';
import { tripK } from './trip-k.ts';
import { roundTo as r } from '../stats/round.ts';

/** days: mean Gregorian month, 365.2425 / 12. */
export const MONTH_DAYS = 30.436875;

/** One interval between cleanings (or from the start of the data), fitted by Theil–Sen. */
export interface FoulingSegment {
  /** What the interval starts at: a maintenance entry that renews the band, or the first trip seen. */
  starts_at: 'maintenance' | 'data';
  start: string;
  end: string;
  trips: number;
  km: number;
  /** W/(m²·K): the line's k at the interval's start (the clean k when it starts at a cleaning). */
  k0_w_m2k: number;
  /** %/month of k0 lost (positive = fouling), with Sen's 95 % interval. */
  loss_pct_per_month: number;
  loss_pct_per_month_ci95: [number, number] | null;
  /** % of k0 lost per 1000 km driven. */
  loss_pct_per_1000km: number | null;
}

export interface BandFouling {
  band: Band;
  segments: FoulingSegment[];
  /**
   * Trips left out because a cause other than fouling that takes k from this band had been named by
   * then (health/causes.ts): how many in all, and from when and for what the first time.
   */
  left_out_trips: number;
  left_out_from: string | null;
  left_out_cause: Cause | null;
  /** Median over the fitted intervals; null when none could be fitted. */
  loss_pct_per_month: number | null;
  loss_pct_per_1000km: number | null;
  /** W/(m²·K): clean k, the median k0 of intervals that start at maintenance (else of all intervals). */
  k_clean_w_m2k: number | null;
  /** –: k ÷ clean k at which the vehicle is due for inspection (health or margin rule, whichever first). */
  inspect_ratio: number | null;
  inspect_basis: 'health' | 'margin' | null;
  /** Days and km from cleaning to the inspection threshold at the fitted rate; null when k does not fall. */
  days_to_inspect: number | null;
  km_to_inspect: number | null;
  /**
   * –: extra area so the radiator still meets its design point after `cleaning_interval_days`: L/(1 − L);
   * null when there is no fit, or when it comes out above `max_fouling_allowance` (then the note says why).
   */
  fouling_allowance: number | null;
  /** Why no allowance is given although k was fitted; null otherwise. */
  fouling_allowance_note: string | null;
}

/**
 * The band a cause other than fouling takes k from: a fan fault the fan band (the ram band never
 * depended on the fan); a coolant-side loss and a biased sensor both.
 */
const TAKES_FROM: Record<Exclude<Cause, 'none' | 'fouling'>, readonly Band[]> = {
  fan: ['fan'],
  coolant_flow: ['ram', 'fan'],
  sensor: ['ram', 'fan'],
};
const takesFrom = (c: Cause | undefined, band: Band) =>
  c !== undefined && c !== 'none' && c !== 'fouling' && TAKES_FROM[c].includes(band);

interface Point {
  t_ms: number;
  km: number;
  k: number;
}

interface Interval {
  start_ms: number;
  starts_at: 'maintenance' | 'data';
  points: Point[];
  left_out: { trips: number; from_ms: number; cause: Cause } | null;
}

/**
 * Splits the band's valid trip k into intervals at the maintenance that renews the band. Once a cause
 * other than fouling that takes k from the band is named (`causes`, per trip), the interval's later
 * trips are left out: what they lose is not fouling.
 */
function intervals(
  trips: readonly TripResult[],
  band: Band,
  renew_ms: readonly number[],
  causes: readonly (Cause | undefined)[],
): Interval[] {
  const out: Interval[] = [];
  let km = 0;
  let next = 0;
  for (const [i, t] of trips.entries()) {
    const t_ms = Date.parse(t.start);
    let cur = out.at(-1);
    while (next < renew_ms.length && t_ms >= renew_ms[next]!) {
      cur = { start_ms: renew_ms[next++]!, starts_at: 'maintenance', points: [], left_out: null };
      out.push(cur);
      km = 0;
    }
    if (!cur) out.push((cur = { start_ms: t_ms, starts_at: 'data', points: [], left_out: null }));
    const c = causes[i];
    if (cur.left_out === null && takesFrom(c, band)) cur.left_out = { trips: 0, from_ms: t_ms, cause: c! };
    const k = tripK(t, band);
    if (cur.left_out !== null) cur.left_out.trips++;
    else if (k !== null) cur.points.push({ t_ms, km, k });
    km += t.distance_km;
  }
  return out;
}

function fitSegment(seg: Interval, o: SizingOptions): FoulingSegment | null {
  const pts = seg.points;
  if (pts.length < o.min_fouling_trips) return null;
  const days = pts.map((p) => (p.t_ms - seg.start_ms) / DAY_MS);
  if (days.at(-1)! - days[0]! < o.min_fouling_span_days) return null;
  const k = pts.map((p) => p.k);
  const byDay = theilSen(days, k);
  const k0 = byDay.intercept;
  if (!(k0 > 0)) return null;
  const pctMonth = (slope: number) => (-100 * slope * MONTH_DAYS) / k0;
  const kms = pts.map((p) => p.km);
  const byKm = kms.at(-1)! > kms[0]! ? theilSen(kms, k) : null;
  const ci = byDay.slope_ci95;
  return {
    starts_at: seg.starts_at,
    start: new Date(seg.start_ms).toISOString(),
    end: new Date(pts.at(-1)!.t_ms).toISOString(),
    trips: pts.length,
    km: r(kms.at(-1)!, 1),
    k0_w_m2k: r(k0, 1),
    loss_pct_per_month: r(pctMonth(byDay.slope), 3),
    loss_pct_per_month_ci95: ci ? [r(pctMonth(ci[1]), 3), r(pctMonth(ci[0]), 3)] : null,
    loss_pct_per_1000km: byKm ? r((-100 * byKm.slope * 1000) / k0, 3) : null,
  };
}

/**
 * –: k ÷ clean k at which inspection is due: the policy's health ratio, or the ratio at which the
 * design margin reaches the policy's inspect margin (margin scales with kA: (1 + m_thr)/(1 + m_clean)),
 * whichever is reached first (the higher ratio).
 */
export function inspectRatio(
  v: VehicleModel,
  band: Band,
  kClean: number,
): { ratio: number; basis: 'health' | 'margin' } {
  const ka = designKa_w_k(v, band, kClean);
  const mClean = marginPct(ka, v.coolant_limit_c, v.design.ambient_c, v.design.heat_kw);
  const byMargin = (1 + v.policy.inspect_margin_pct / 100) / (1 + mClean / 100);
  const byHealth = v.policy.inspect_health_ratio;
  return byMargin > byHealth ? { ratio: byMargin, basis: 'margin' } : { ratio: byHealth, basis: 'health' };
}

/**
 * Fouling rate per band, per month and per 1000 km (docs/methods.md §6): Theil–Sen lines of
 * trip k against days and against km since each cleaning (robust to the odd bad trip; Theil 1950,
 * Sen 1968), as a share of the interval's starting k. The straight line is the conservative reading of
 * fouling that levels off (Kern & Seaton 1959) over the interval observed. Trips in time order;
 * `causes`: the cause the health assessment named after each trip, so that trips after a fan fault,
 * a coolant-side loss or a suspect sensor is named do not count as fouling.
 */
export function foulingRates(
  v: VehicleModel,
  trips: readonly TripResult[],
  o: SizingOptions,
  causes: readonly (Cause | undefined)[] = [],
): BandFouling[] {
  return BAND_NAMES.map((band) => {
    const all = intervals(trips, band, rebaselineTimes_ms(v.maintenance, band), causes);
    const segs = all.map((s) => fitSegment(s, o)).filter((s): s is FoulingSegment => s !== null);
    const out = all.filter((s) => s.left_out !== null).map((s) => s.left_out!);
    const med = (xs: (number | null)[]) => {
      const ok = xs.filter((x): x is number => x !== null);
      return ok.length ? r(median(ok), 3) : null;
    };
    const perMonth = med(segs.map((s) => s.loss_pct_per_month));
    const perKm = med(segs.map((s) => s.loss_pct_per_1000km));
    const cleanSegs = segs.filter((s) => s.starts_at === 'maintenance');
    const kClean = med((cleanSegs.length ? cleanSegs : segs).map((s) => s.k0_w_m2k));
    const thr = kClean !== null ? inspectRatio(v, band, kClean) : null;
    const toGo = thr ? Math.max(0, 1 - thr.ratio) : null;
    const span = (rate: number | null, unit: number) =>
      toGo === null || rate === null || !(rate > 0) ? null : r((toGo * 100 * unit) / rate, 1);
    const lossAtInterval =
      perMonth !== null ? Math.max(0, (perMonth / 100) * (o.cleaning_interval_days / MONTH_DAYS)) : null;
    const allowance = allowanceFor(lossAtInterval, perMonth, o);
    return {
      band,
      segments: segs,
      left_out_trips: out.reduce((n, x) => n + x.trips, 0),
      left_out_from: out.length ? new Date(out[0]!.from_ms).toISOString() : null,
      left_out_cause: out[0]?.cause ?? null,
      loss_pct_per_month: perMonth,
      loss_pct_per_1000km: perKm,
      k_clean_w_m2k: kClean,
      inspect_ratio: thr ? r(thr.ratio, 4) : null,
      inspect_basis: thr?.basis ?? null,
      days_to_inspect: span(perMonth, MONTH_DAYS),
      km_to_inspect: span(perKm, 1000),
      fouling_allowance: allowance.value,
      fouling_allowance_note: allowance.note,
    };
  });
}

/**
 * The allowance L/(1 − L) for a loss L of k over the cleaning interval, when it is one fouling can
 * plausibly need (≤ `max_fouling_allowance`); else none, and why: k falling that fast is more than
 * fouling (a loss the health assessment has not named yet) or a record too short to tell.
 */
function allowanceFor(
  loss: number | null,
  perMonth: number | null,
  o: SizingOptions,
): { value: number | null; note: string | null } {
  if (loss === null) return { value: null, note: null };
  const value = loss < 1 ? loss / (1 - loss) : Number.POSITIVE_INFINITY;
  if (value <= o.max_fouling_allowance) return { value: r(value, 4), note: null };
  const extra = Number.isFinite(value) ? `${(100 * value).toFixed(0)} % more area` : 'no area enough';
  return {
    value: null,
    note: `k fell ${perMonth!.toFixed(1)} % a month: over ${o.cleaning_interval_days} days that would need ${extra}, beyond the ${(100 * o.max_fouling_allowance).toFixed(0)} % fouling can plausibly need (common practice plans 10–25 %); a fall this fast is more than fouling (a loss not named yet), or the record is too short to tell`,
  };
}
