import type { VehicleAssessment } from '@thermargin/core/health/assess';

/** trips, 10: the level's move over the last trips a trend must not contradict. */
export const COHERENCE = { trips: 10 } as const;

/** Robust σ of a series from its successive differences (1.4826·MAD/√2), as core's detectors take it. */
function noise(v: readonly number[]): number {
  const d = v.slice(1).map((x, i) => x - v[i]!);
  const med = (a: number[]) => {
    const s = [...a].sort((x, y) => x - y);
    return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
  };
  const m = med(d);
  return (1.4826 * med(d.map((x) => Math.abs(x - m)))) / Math.SQRT2;
}

/**
 * What a vehicle's figures say against each other, in words (empty when they agree): the trend word and
 * a projected date against the margin level's move over its last `trips` trips, beyond the level's own
 * noise (two standard errors of the difference of two 30-trip levels, 2·√2·2σ/√30 ≈ σ, σ the trip
 * margins' noise); a vehicle at inspect must read as due, never as a crossing far ahead; the finding's
 * rate must be the trend's.
 */
export function coherenceProblems(a: VehicleAssessment, o = COHERENCE): string[] {
  const out: string[] = [];
  const s = a.series;
  const order = s.time_ms.map((_, i) => i).sort((x, y) => s.time_ms[x]! - s.time_ms[y]!);
  // The level restarts at a change point or a re-baseline: moves across a restart are not a trend, nor
  // are those of its first `trips` values (a level of a few trips moves by more than its noise).
  const band = s[s.margin.basis];
  const restart = Math.max(
    Number.NEGATIVE_INFINITY,
    ...band.change_points.map((c) => Date.parse(c.signal)),
    ...band.baselines.map((b) => Date.parse(b.start)),
  );
  const levels = order
    .filter((i) => s.time_ms[i]! > restart)
    .map((i) => s.margin.level_pct[i]!)
    .filter((v): v is number => v !== null)
    .slice(o.trips);
  const last = levels.slice(-o.trips);
  const moved = last.length === o.trips ? last[last.length - 1]! - last[0]! : null;
  const trend = s.margin.trend ?? null;
  const own = order
    .filter((i) => s.margin.source?.[i] === 'trip')
    .map((i) => s.margin.pct[i]!)
    .filter((v): v is number => v !== null);
  const tolerance = own.length > 3 ? noise(own) : 0;
  if (moved !== null && trend?.word === 'falling' && moved > tolerance)
    out.push(`trend falling while the level rose ${moved.toFixed(1)} points over ${o.trips} trips`);
  if (moved !== null && trend?.word === 'rising' && moved < -tolerance)
    out.push(`trend rising while the level fell ${(-moved).toFixed(1)} points over ${o.trips} trips`);
  if (a.status !== 'inspect' && a.projected_inspect_date !== null) {
    if (trend?.word !== 'falling') out.push(`a projected date with the trend ${trend?.word ?? 'not judged'}`);
    if (moved !== null && moved > tolerance)
      out.push(`a projected date while the level rose ${moved.toFixed(1)} points`);
  }
  if (a.status === 'inspect') {
    if (/more than \d+ days ahead/.test(s.projection.reason ?? ''))
      out.push(`at inspect, the projection reads "${s.projection.reason}"`);
    if (a.projected_inspect_overdue_days === null) out.push('at inspect, the date does not read as overdue');
  }
  const quoted = /margin (?:falling|rising) ([\d.]+) points per 30 days/.exec(a.cause_evidence);
  if (quoted && (!trend || quoted[1] !== Math.abs(trend.pct_per_30d).toFixed(1)))
    out.push(
      `the finding quotes ${quoted[1]} points per 30 days, the trend ${trend?.pct_per_30d.toFixed(1)}`,
    );
  if (trend && trend.word !== 'steady' && !quoted) out.push('the finding does not quote the trend');
  return out;
}
