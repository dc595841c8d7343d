import type { SampleColumns } from '@thermargin/shared';
import { LineSums } from '../stats/line-sums.ts';

/** Sensor plausibility rules; defaults defined once here. */
export const SENSOR_CHECK_DEFAULTS = {
  /** min, 10: a coolant temperature frozen this long while the heat input moves is a stuck sensor. */
  stuck_coolant_min: 10,
  /** min, 60: ambient air changes slowly; frozen for an hour of driving it is suspect. */
  stuck_ambient_min: 60,
  /** kW, 5: heat-input spread within a run that a live coolant sensor would have answered. */
  stuck_heat_spread_kw: 5,
  /** %, 95: fan duty counted as saturated. */
  fan_saturated_pct: 95,
  /** h, 6: stop after which the loop is taken as soaked to ambient (the soak check, common practice). */
  soak_min_h: 6,
  /** s, 30: the samples after key-on whose line, back at key-on, gives the soak offset (the loop warms
   *  from the first second: a small loop under idle load gains ≈ 0.2 K/s, so a median of the first
   *  samples would read warm; the line's noise at 0.2 K and 1 Hz is ≈ 0.07 K). */
  soak_fit_s: 30,
} as const;

/** Longest run of exactly repeated values in [from, to): its length in minutes and the heat spread in it. */
function longestFrozenRun(
  x: Float64Array,
  t: Float64Array,
  heat_kw: Float64Array,
  from: number,
  to: number,
): { minutes: number; value: number; heatSpread_kw: number } {
  let best = { minutes: 0, value: Number.NaN, heatSpread_kw: 0 };
  let start = from;
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (let i = from; i <= to; i++) {
    if (i === to || Number.isNaN(x[i]!) || x[i] !== x[start]) {
      const minutes = (t[i - 1]! - t[start]!) / 60_000;
      if (i > start && minutes > best.minutes) best = { minutes, value: x[start]!, heatSpread_kw: hi - lo };
      start = i;
      lo = Number.POSITIVE_INFINITY;
      hi = Number.NEGATIVE_INFINITY;
    }
    if (i < to) {
      const q = heat_kw[i - from]!;
      if (q < lo) lo = q;
      if (q > hi) hi = q;
    }
  }
  return best;
}

/** Stuck-signal findings of one trip, in words. `heat_kw` holds the trip's heat generated, index i − from. */
export function stuckSignals(
  c: SampleColumns,
  from: number,
  to: number,
  heat_kw: Float64Array,
  o = SENSOR_CHECK_DEFAULTS,
): string[] {
  const flags: string[] = [];
  for (const name of ['coolant_in_c', 'coolant_out_c'] as const) {
    const run = longestFrozenRun(c[name], c.time_ms, heat_kw, from, to);
    if (run.minutes >= o.stuck_coolant_min && run.heatSpread_kw >= o.stuck_heat_spread_kw)
      flags.push(
        `${name} stuck at ${run.value.toFixed(1)} °C for ${Math.round(run.minutes)} min while the heat input varied`,
      );
  }
  const amb = longestFrozenRun(c.ambient_c, c.time_ms, heat_kw, from, to);
  if (amb.minutes >= o.stuck_ambient_min)
    flags.push(`ambient_c stuck at ${amb.value.toFixed(1)} °C for ${Math.round(amb.minutes)} min`);
  return flags;
}

/**
 * K: coolant_in − ambient at key-on after a soak of ≥ soak_min_h, or null when the stop was shorter or
 * unknown: the least-squares line of the difference over the first soak_fit_s, at the first sample.
 */
export function soakOffset_k(
  c: SampleColumns,
  from: number,
  to: number,
  previousEnd_ms: number | null,
  o = SENSOR_CHECK_DEFAULTS,
): number | null {
  if (previousEnd_ms === null || c.time_ms[from]! - previousEnd_ms < o.soak_min_h * 3_600_000) return null;
  const t0 = c.time_ms[from]!;
  const line = new LineSums();
  for (let i = from; i < to && c.time_ms[i]! - t0 <= o.soak_fit_s * 1000; i++)
    line.add((c.time_ms[i]! - t0) / 1000, c.coolant_in_c[i]! - c.ambient_c[i]!);
  return line.valueAtZero();
}
