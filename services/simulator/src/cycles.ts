import type { Rng } from '@thermargin/core/stats/prng';

/**
 * Drive cycles: what the driver asks for, second by second — target speed, road grade and extra
 * auxiliary load. The vehicle model follows the target as far as its power (and any derate) allows.
 * Four kinds, each an invented but plausible pattern (common practice for duty-cycle synthesis):
 * - urban: stop-and-go between stops, 25–50 km/h cruise, 10–40 s dwell;
 * - highway: steady cruise with small speed wander and the odd slow-down;
 * - grades: a long climb and the descent back, at a speed the grade allows;
 * - idle: standing with a high auxiliary load (layover battery charging, A/C, power take-off).
 */
export type CycleKind = 'urban' | 'highway' | 'grades' | 'idle';
export const CYCLE_KINDS: readonly CycleKind[] = ['urban', 'highway', 'grades', 'idle'];

export interface Segment {
  kind: CycleKind;
  /** s: how long the segment runs. */
  duration_s: number;
  /** km/h: cruise speed (urban, highway) or climbing speed (grades); ignored by idle. */
  speed_kmh: number;
  /** %: climb grade (grades); ignored by the others. */
  grade_pct: number;
  /** kW: auxiliary load added during the segment (idle's charging or power take-off). */
  aux_kw: number;
}

/** Target course of one trip, 1 Hz. */
export interface Drive {
  n: number;
  speed_kmh: Float32Array;
  grade_pct: Float32Array;
  aux_kw: Float32Array;
}

class DriveBuilder {
  speed: number[] = [];
  grade: number[] = [];
  aux: number[] = [];
  push(speed_kmh: number, grade_pct: number, aux_kw: number): void {
    this.speed.push(Math.max(0, speed_kmh));
    this.grade.push(grade_pct);
    this.aux.push(aux_kw);
  }
  /** Linear speed ramp from the last target to `to_kmh` at `rate_ms2`. */
  ramp(to_kmh: number, rate_ms2: number, grade_pct: number, aux_kw: number): void {
    const from = this.speed.at(-1) ?? 0;
    const steps = Math.max(1, Math.round(Math.abs(to_kmh - from) / 3.6 / rate_ms2));
    for (let i = 1; i <= steps; i++) this.push(from + ((to_kmh - from) * i) / steps, grade_pct, aux_kw);
  }
  hold(speed_kmh: number, seconds: number, grade_pct: number, aux_kw: number): void {
    for (let i = 0; i < seconds; i++) this.push(speed_kmh, grade_pct, aux_kw);
  }
  build(): Drive {
    return {
      n: this.speed.length,
      speed_kmh: Float32Array.from(this.speed),
      grade_pct: Float32Array.from(this.grade),
      aux_kw: Float32Array.from(this.aux),
    };
  }
}

function urban(b: DriveBuilder, s: Segment, rng: Rng): void {
  const end = b.speed.length + s.duration_s;
  while (b.speed.length < end) {
    const cruise = s.speed_kmh * rng.uniform(0.7, 1.15);
    const grade = rng.uniform(-2, 2);
    b.ramp(cruise, rng.uniform(0.7, 1.1), grade, s.aux_kw);
    b.hold(cruise, rng.int(15, 70), grade, s.aux_kw);
    b.ramp(0, rng.uniform(0.8, 1.2), grade, s.aux_kw);
    b.hold(0, rng.int(10, 40), grade, s.aux_kw);
  }
}

function highway(b: DriveBuilder, s: Segment, rng: Rng): void {
  const end = b.speed.length + s.duration_s;
  b.ramp(s.speed_kmh, 0.6, 0, s.aux_kw);
  let grade = 0;
  while (b.speed.length < end - 60) {
    // rolling country: gentle grades a few minutes long, now and then a slow-down in traffic
    grade = Math.max(-3, Math.min(3, 0.6 * grade + rng.normal() * 1.2));
    const v = s.speed_kmh * (1 + 0.03 * rng.normal());
    if (rng.chance(0.05)) {
      b.ramp(s.speed_kmh * 0.6, 0.5, grade, s.aux_kw);
      b.ramp(v, 0.4, grade, s.aux_kw);
    }
    b.hold(v, rng.int(60, 240), grade, s.aux_kw);
  }
  b.ramp(0, 0.8, 0, s.aux_kw);
}

function grades(b: DriveBuilder, s: Segment, rng: Rng): void {
  const climb_s = Math.round(s.duration_s * 0.6);
  b.ramp(s.speed_kmh, 0.5, s.grade_pct, s.aux_kw);
  for (let t = 0; t < climb_s; t += 60)
    b.hold(s.speed_kmh * (1 + 0.04 * rng.normal()), 60, s.grade_pct * rng.uniform(0.85, 1.15), s.aux_kw);
  b.hold(s.speed_kmh * 1.2, s.duration_s - climb_s, -s.grade_pct, s.aux_kw);
  b.ramp(0, 0.8, 0, s.aux_kw);
}

function idle(b: DriveBuilder, s: Segment): void {
  b.ramp(0, 1, 0, s.aux_kw);
  b.hold(0, s.duration_s, 0, s.aux_kw);
}

/** The target course of a trip made of segments, each drawn from `rng` (same rng state → same course). */
export function buildDrive(segments: readonly Segment[], rng: Rng): Drive {
  const b = new DriveBuilder();
  for (const s of segments) {
    if (s.kind === 'urban') urban(b, s, rng);
    else if (s.kind === 'highway') highway(b, s, rng);
    else if (s.kind === 'grades') grades(b, s, rng);
    else idle(b, s);
  }
  b.hold(0, 20, 0, 0); // pull in and key off
  return b.build();
}
