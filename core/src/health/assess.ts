import { DAY_MS } from '@thermargin/shared/time';
import type { Alert, Cause, Status, TripResult } from '@thermargin/shared';
import type { Band } from '../trip/bands.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import type { Candidate } from './causes.ts';
import { type HealthOptions, resolveHealthOptions } from './options.ts';
import { type Projection, projectMargin } from './projection.ts';
import { bandSeries, type HealthSeries, isoOfDay } from './series.ts';
import { latForMargin_c } from './thresholds.ts';
import { type MarginTrend, trendWords } from './trend.ts';
import { ownMargin, type TripMargin } from './trip-margins.ts';
import { TripWalk } from './walk.ts';
import { overdueDays } from './due.ts';

export type { HealthOptions } from './options.ts';
export { HEALTH_DEFAULTS } from './options.ts';
export type { HealthSeries } from './series.ts';

/** What the assessment adds to each trip: health per band, status, and the margin from the governing band. */
export interface TripHealth extends TripMargin {
  health_ram: number | null;
  health_fan: number | null;
  status: Status;
  /** The cause named after this trip ('none' while none is). */
  cause: Cause;
  /** The trip's own margin, LAT and basis from its own k (margin_pct may be the band's level instead). */
  trip_margin_pct: number | null;
  trip_limiting_ambient_c: number | null;
  trip_margin_basis: Band | null;
}

export interface VehicleAssessment {
  health: { ram: number | null; fan: number | null };
  status: Status;
  cause: Cause;
  cause_evidence: string;
  /** ISO time the margin is projected to cross the inspect threshold; when already in inspect, since when; null when the data cannot tell. */
  projected_inspect_date: string | null;
  /** Whole days that date lies before the latest trip's end (overdue); null when ahead or none. */
  projected_inspect_overdue_days: number | null;
  alerts: Alert[];
  /** Same order as the input trips. */
  trips: TripHealth[];
  /** Ranked, best first. */
  candidates: Candidate[];
  series: HealthSeries;
  notes: string[];
}

function startMs(t: TripResult, i: number): number {
  const ms = Date.parse(t.start);
  if (!Number.isFinite(ms))
    throw new RangeError(`assessVehicle: trips[${i}].start "${t.start}" is not an ISO time`);
  return ms;
}

/**
 * Health, status, cause and projection for one vehicle from its per-trip results. Every decision at a
 * trip uses only that trip and earlier ones, as a live system would (the walk, walk.ts); trips may come
 * in any order (they are taken by start time, and answered in the input order). Trips with sensor flags
 * give no k.
 */
export function assessVehicle(
  vehicle: VehicleModel,
  trips: readonly TripResult[],
  options: Partial<HealthOptions> = {},
): VehicleAssessment {
  const o = resolveHealthOptions(options);
  const times = trips.map(startMs);
  const order = trips.map((_, i) => i).sort((a, b) => times[a]! - times[b]!);
  const walk = new TripWalk(vehicle, trips.length, o);
  for (const [j, i] of order.entries()) walk.visit(trips[i]!, i, j, times[i]!);
  const lastMargin = order.length ? walk.marginLevel[order[order.length - 1]!]! : null;
  const dueSince = walk.status === 'inspect' ? walk.log.inspectSince : null;
  const read = walk.trendRead();
  const trend = read.trend;
  const proj = projectMargin(read, walk.thresholds.inspect_enter, o);
  const notes = findingNotes(walk, trips, lastMargin, dueSince, proj);
  const ram = walk.bands.ram.summary();
  const fan = walk.bands.fan.summary();
  let causeEvidence = walk.cause.evidence;
  if (walk.cause.cause === 'none' && (!ram.level || !fan.level || lastMargin === null)) {
    causeEvidence = `not enough data to judge every band: ${notes.join('; ')}`;
  }
  if (trend && trend.word !== 'steady') causeEvidence = `${causeEvidence}; ${trendWords(trend)}`;
  if (walk.warning && !causeEvidence.includes(walk.warning))
    causeEvidence = `${causeEvidence}; ${walk.warning}`;
  const date = dueSince ?? isoOfDay(proj.cross_day);
  const asof = trips.reduce((x, t) => Math.max(x, Date.parse(t.end)), Number.NEGATIVE_INFINITY);

  return {
    health: { ram: ram.level?.value ?? null, fan: fan.level?.value ?? null },
    status: walk.status,
    cause: walk.cause.cause,
    cause_evidence: causeEvidence,
    projected_inspect_date: date,
    projected_inspect_overdue_days: overdueDays(date, asof),
    alerts: walk.log.alerts,
    trips: tripHealth(walk, trips, order),
    candidates: walk.candidates,
    notes,
    series: healthSeries(
      walk,
      vehicle,
      times,
      order,
      dueSince ? dueProjection(proj, dueSince) : proj,
      trend,
      o,
    ),
  };
}

/**
 * Once inspection is due the vehicle's one date is when it became due: the chart's projection says
 * so instead of a crossing of its own (which may lie ahead when k's health ratio made the status).
 */
function dueProjection(p: Projection, since: string): Projection {
  return {
    ...p,
    cross_day: Date.parse(since) / DAY_MS,
    interval_days: null,
    reason: `inspection due since ${since.slice(0, 10)}`,
  };
}

/** Health per trip is read after the walk: the first trips' health is known once their baseline is. */
function tripHealth(walk: TripWalk, trips: readonly TripResult[], order: readonly number[]): TripHealth[] {
  const out: TripHealth[] = walk.statuses.map((status, i) => {
    const own = ownMargin(trips[i]!);
    return {
      health_ram: null,
      health_fan: null,
      status,
      cause: walk.causes[i]!,
      ...walk.tripMargins.out[i]!,
      trip_margin_pct: own.pct,
      trip_limiting_ambient_c: own.lat,
      trip_margin_basis: own.basis,
    };
  });
  for (const b of ['ram', 'fan'] as const) {
    for (const q of walk.bands[b].points)
      out[order[q.trip]!]![b === 'ram' ? 'health_ram' : 'health_fan'] = q.health;
  }
  return out;
}

/** What the finding must say it could not judge, and why there is no date. */
function findingNotes(
  walk: TripWalk,
  trips: readonly TripResult[],
  lastMargin: number | null,
  dueSince: string | null,
  proj: Projection,
): string[] {
  const n = trips.length;
  const notes: string[] = [];
  for (const b of [walk.bands.ram.summary(), walk.bands.fan.summary()]) {
    if (!b.level) {
      notes.push(`${b.band} band reached on ${b.valid_trips} of ${n} trips: ${b.band} health not judged`);
    }
  }
  if (lastMargin === null) {
    notes.push(
      `margin not judged: the design point's ${walk.basis} band gave a margin on ${walk.margins.count} of ${n} trips`,
    );
  }
  if (!trips.some((t) => t.coolant_dt_per_kw !== null))
    notes.push('no radiator outlet temperature: coolant flow cannot be confirmed');
  if (dueSince) notes.push(`inspection due since ${dueSince.slice(0, 10)}`);
  else if (proj.reason && lastMargin !== null) notes.push(`no inspection date projected: ${proj.reason}`);
  if (walk.warning) notes.push(walk.warning);
  return notes;
}

function healthSeries(
  walk: TripWalk,
  vehicle: VehicleModel,
  times: readonly number[],
  order: readonly number[],
  proj: Projection,
  trend: MarginTrend | null,
  o: HealthOptions,
): HealthSeries {
  const lat = (m: number | null) =>
    m === null ? null : latForMargin_c(m, vehicle.coolant_limit_c, vehicle.design.ambient_c);
  const th = walk.thresholds;
  return {
    time_ms: [...times],
    ram: bandSeries(walk.bands.ram, order, o),
    fan: bandSeries(walk.bands.fan, order, o),
    margin: {
      basis: walk.basis,
      pct: walk.tripMargins.out.map((m) => m.margin_pct),
      source: walk.tripMargins.out.map((m) => m.margin_source),
      level_pct: walk.marginLevel,
      lat_c: walk.tripMargins.out.map((m) => m.limiting_ambient_c),
      lat_level_c: walk.marginLevel.map(lat),
      inspect_below_pct: th.inspect_enter,
      watch_below_pct: th.watch_enter,
      trend: trend && {
        word: trend.word,
        pct_per_30d: trend.pct_per_30d,
        pct_per_30d_ci95: trend.pct_per_30d_ci95,
        since: isoOfDay(trend.from_day)!,
        trips: trend.trips,
      },
    },
    projection: {
      method: proj.method,
      threshold_pct: proj.threshold_pct,
      date: isoOfDay(proj.cross_day),
      interval: proj.interval_days && [isoOfDay(proj.interval_days[0]), isoOfDay(proj.interval_days[1])],
      curve: {
        time_ms: proj.curve.day.map((d) => d * DAY_MS),
        margin_pct: proj.curve.margin_pct,
        lat_c: proj.curve.margin_pct.map((m) => lat(m)!),
      },
      reason: proj.reason,
    },
  };
}
