import { type Rng, uniform } from './prng.ts';

/**
 * A trip as a list of segments, turned into a drive trace (speed, acceleration, grade, auxiliary load,
 * ambient) at the model's integration step. A first-order speed follower with acceleration limits
 * joins the segments smoothly.
 */
export type Segment =
  | {
      kind: 'highway';
      duration_s: number;
      min_kmh: number;
      max_kmh: number;
      /** –: mean grade (a long climb) and amplitude of the rolling grade on top (0.02 = 2 %). */
      grade_mean: number;
      grade: number;
      /** m: wavelength of the rolling grade. */
      grade_wavelength_m: number;
    }
  | {
      kind: 'crawl';
      duration_s: number;
      max_kmh: number;
      /** –: mean grade of the route (a hilly district climbs). */
      grade: number;
      /** s: ranges of the go and stop phases of stop-and-go traffic. */
      go_s: [number, number];
      stop_s: [number, number];
      /** kW: extra auxiliary load on this leg. */
      extra_kw?: number;
    }
  | {
      kind: 'idle';
      duration_s: number;
      /** kW: extra auxiliary load while standing (a power take-off, cabin cooling at a stop). */
      extra_kw?: number;
    };

export interface TripProfile {
  segments: Segment[];
  /** kW: auxiliary load (HVAC, compressors) carried all trip. */
  aux_kw: number;
  /** °C: ambient at the start and the end (a warming day), with a small slow wiggle. */
  ambient_start_c: number;
  ambient_end_c: number;
}

export interface DriveTrace {
  step_s: number;
  n: number;
  speed_ms: Float64Array;
  accel_ms2: Float64Array;
  grade: Float64Array;
  aux_kw: Float64Array;
  ambient_c: Float64Array;
}

const ACCEL_MAX_MS2 = 0.9;
const DECEL_MAX_MS2 = 1.5;
const FOLLOW_TAU_S = 4;

/** Speed target and grade of one segment, stepped in time. */
function segmentDriver(
  seg: Segment,
  rng: Rng,
): (t_s: number, v_ms: number, x_m: number) => { target_ms: number; grade: number } {
  if (seg.kind === 'idle') return () => ({ target_ms: 0, grade: 0 });
  if (seg.kind === 'highway') {
    const phase = [uniform(rng, 0, 6.28), uniform(rng, 0, 6.28)];
    let next_s = 0;
    let target = 0;
    return (t_s, _v, x_m) => {
      if (t_s >= next_s) {
        target = uniform(rng, seg.min_kmh, seg.max_kmh) / 3.6;
        next_s = t_s + uniform(rng, 60, 240);
      }
      const w = (2 * Math.PI * x_m) / seg.grade_wavelength_m;
      const rolling = (Math.sin(w + phase[0]!) + 0.4 * Math.sin(2.7 * w + phase[1]!)) / 1.4;
      return { target_ms: target, grade: seg.grade_mean + seg.grade * rolling };
    };
  }
  let going = false;
  let until_s = 0;
  let target = 0;
  return (t_s, v_ms, x_m) => {
    if (t_s >= until_s && (going || v_ms < 0.05)) {
      going = !going;
      until_s = t_s + uniform(rng, ...(going ? seg.go_s : seg.stop_s));
      target = going ? uniform(rng, 0.6, 1) * (seg.max_kmh / 3.6) : 0;
    }
    return { target_ms: target, grade: seg.grade * (1 + 0.3 * Math.sin((2 * Math.PI * x_m) / 900)) };
  };
}

export function driveTrace(p: TripProfile, step_s: number, rng: Rng): DriveTrace {
  const total_s = p.segments.reduce((s, g) => s + g.duration_s, 0);
  const n = Math.round(total_s / step_s);
  const tr: DriveTrace = {
    step_s,
    n,
    speed_ms: new Float64Array(n),
    accel_ms2: new Float64Array(n),
    grade: new Float64Array(n),
    aux_kw: new Float64Array(n),
    ambient_c: new Float64Array(n),
  };
  let v = 0;
  let x = 0;
  let i = 0;
  let segStart_s = 0;
  for (const seg of p.segments) {
    const drive = segmentDriver(seg, rng);
    const extra_kw = seg.kind === 'highway' ? 0 : (seg.extra_kw ?? 0);
    const end = Math.min(n, Math.round((segStart_s + seg.duration_s) / step_s));
    for (; i < end; i++) {
      const t = i * step_s;
      const { target_ms, grade } = drive(t, v, x);
      const a = Math.max(-DECEL_MAX_MS2, Math.min(ACCEL_MAX_MS2, (target_ms - v) / FOLLOW_TAU_S));
      tr.speed_ms[i] = v;
      tr.accel_ms2[i] = a;
      tr.grade[i] = grade;
      const f = t / total_s;
      tr.aux_kw[i] = p.aux_kw * (1 + 0.1 * Math.sin((2 * Math.PI * t) / 700)) + extra_kw;
      tr.ambient_c[i] =
        p.ambient_start_c +
        f * (p.ambient_end_c - p.ambient_start_c) +
        0.3 * Math.sin((2 * Math.PI * t) / 1200);
      x += v * step_s;
      v = Math.max(0, v + a * step_s);
    }
    segStart_s += seg.duration_s;
  }
  return tr;
}
