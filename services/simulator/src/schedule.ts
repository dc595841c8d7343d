import { DAY_MS } from '@thermargin/shared/time';
import type { ServicePattern } from './archetypes.ts';
import { buildDrive, type CycleKind, type Drive, type Segment } from './cycles.ts';
import { hashKey, type Rng, streamFor } from '@thermargin/core/stats/prng';
import type { SimVehicle } from './vehicle.ts';

/** One planned trip: when, what the driver asks for, and the load carried. */
export interface TripPlan {
  /** Trip id: `<vehicle>-<YYYYMMDD>-<n>`. */
  id: string;
  start_ms: number;
  drive: Drive;
  payload_kg: number;
  /** Seed of the trip's sensor noise. */
  noise_seed: number;
}

/** Local calendar day number (days since 1970-01-01 local) of an instant. */
export function localDay(t_ms: number, utc_offset_h: number): number {
  return Math.floor((t_ms + utc_offset_h * 3_600_000) / DAY_MS);
}

const SEGMENT_MIN: Record<Exclude<CycleKind, 'idle'>, readonly [number, number]> = {
  urban: [15, 35],
  highway: [12, 30],
  grades: [8, 16],
};

function pickKind(mix: ServicePattern['mix'], rng: Rng): CycleKind {
  const total = mix.urban + mix.highway + mix.grades + mix.idle;
  let r = rng.uniform(0, total);
  for (const k of ['urban', 'highway', 'grades'] as const) {
    r -= mix[k];
    if (r < 0) return k;
  }
  return 'idle';
}

/** Segments filling about `duration_s`: a short urban pull-out, then kinds drawn by the duty mix. */
export function composeTrip(d: ServicePattern, duration_s: number, rng: Rng): Segment[] {
  const aux = (r: ServicePattern['idle_aux_kw']) => (typeof r === 'number' ? r : rng.uniform(r[0], r[1]));
  const segs: Segment[] = [
    { kind: 'urban', duration_s: rng.int(180, 360), speed_kmh: d.urban_kmh, grade_pct: 0, aux_kw: 0 },
  ];
  let total = segs[0]!.duration_s;
  while (total < duration_s) {
    const kind = pickKind(d.mix, rng);
    const minutes = kind === 'idle' ? d.idle_min : SEGMENT_MIN[kind];
    const s: Segment = {
      kind,
      duration_s: Math.round(rng.uniform(minutes[0], minutes[1]) * 60),
      speed_kmh: kind === 'highway' ? d.highway_kmh : kind === 'grades' ? d.climb_kmh : d.urban_kmh,
      grade_pct: kind === 'grades' ? rng.uniform(d.climb_grade_pct[0], d.climb_grade_pct[1]) : 0,
      aux_kw: kind === 'idle' ? aux(d.idle_aux_kw) : 0,
    };
    segs.push(s);
    total += s.duration_s;
  }
  return segs;
}

const ymd = (day: number) => new Date(day * DAY_MS).toISOString().slice(0, 10).replace(/-/g, '');

/**
 * The trips of one vehicle on one local day (2–6 by the default duty cycles), drawn from the seed, the
 * vehicle id and the day alone. Trips follow each other with a pause and end before 23:00 local.
 */
export function tripsOfDay(v: SimVehicle, seed: number, day: number, utc_offset_h: number): TripPlan[] {
  const d = v.archetype.duty;
  const rng = streamFor(seed, v.id, 'day', day);
  const dow = (day + 4) % 7; // 1970-01-01 was a Thursday
  if (!d.days_of_week.includes(dow)) return [];
  const dayStart_ms = day * DAY_MS - utc_offset_h * 3_600_000;
  const lastStart_ms = dayStart_ms + 21 * 3_600_000;
  const count = rng.int(d.trips_per_day[0], d.trips_per_day[1]);
  const plans: TripPlan[] = [];
  let t = dayStart_ms + Math.round(rng.uniform(d.first_departure_h[0], d.first_departure_h[1]) * 3600) * 1000;
  for (let k = 1; k <= count && t <= lastStart_ms; k++) {
    const segments = composeTrip(d, Math.round(rng.uniform(d.trip_min[0], d.trip_min[1]) * 60), rng);
    const drive = buildDrive(segments, rng);
    const payload = v.archetype.payload_kg;
    plans.push({
      id: `${v.id}-${ymd(day)}-${k}`,
      start_ms: t,
      drive,
      payload_kg: typeof payload === 'number' ? payload : Math.round(rng.uniform(payload[0], payload[1])),
      noise_seed: hashKey(seed, v.id, day, k, 'noise'),
    });
    t += drive.n * 1000 + Math.round(rng.uniform(d.pause_min[0], d.pause_min[1]) * 60) * 1000;
  }
  return plans;
}
