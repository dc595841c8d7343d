import { DAY_MS } from '@thermargin/shared/time';
import type { Alert, Cause, Status, TripResult } from '@thermargin/shared';
import { CAUSE_WORD } from '@thermargin/shared/results';
import { median } from '../stats/quantile.ts';
import type { Band } from '../trip/bands.ts';
import { designBand } from '../trip/design-point.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { BandMonitor } from './band-monitor.ts';
import { type Candidate, FAN_OVER_RAM, type FanStep, fallZ, rankCauses } from './causes.ts';
import { EvidenceTracker } from './cause-evidence.ts';
import { currentLevel } from './level.ts';
import { type HealthOptions, resolveHealthOptions } from './options.ts';
import { fitAsymptotic, MAX_TRIPS, projectMargin } from './projection.ts';
import { rebaselineTimes_ms } from './rebaseline.ts';
import { bandSeries, type HealthSeries, isoOfDay } from './series.ts';
import { StatusMachine } from './status.ts';
import { latForMargin_c, marginThresholds } from './thresholds.ts';
import { headEnd, lowerBound, tailStart } from '@thermargin/shared/array-index';

export type { HealthOptions } from './options.ts';
export { HEALTH_DEFAULTS } from './options.ts';
export type { HealthSeries } from './series.ts';

export interface TripHealth {
  health_ram: number | null;
  health_fan: number | null;
  status: Status;
}

export interface VehicleAssessment {
  health: { ram: number | null; fan: number | null };
  status: Status;
  cause: Cause;
  cause_evidence: string;
  /** ISO time the margin is projected to cross the inspect threshold; when already in inspect, since when; null when the data cannot tell. */
  projected_inspect_date: string | null;
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

/** Top cause if it scores enough, else none. */
function pickCause(c: readonly Candidate[], min: number): Candidate {
  const top = c.find((x) => x.cause !== 'none' && x.score >= min);
  return top ?? c.find((x) => x.cause === 'none')!;
}

/**
 * Health, status, cause and projection for one vehicle from its per-trip results. Every decision at a
 * trip uses only that trip and earlier ones, as a live system would; trips may come in any order
 * (they are taken by start time, and answered in the input order). Trips with sensor flags give no k.
 */
export function assessVehicle(
  vehicle: VehicleModel,
  trips: readonly TripResult[],
  options: Partial<HealthOptions> = {},
): VehicleAssessment {
  const o = resolveHealthOptions(options);
  const p = vehicle.policy;
  const minDrop = p.watch_health_drop_pct / 100;
  const times = trips.map(startMs);
  const order = trips.map((_, i) => i).sort((a, b) => times[a]! - times[b]!);
  const bench = vehicle.bench_k_w_m2k;
  const bands: Record<Band, BandMonitor> = {
    ram: new BandMonitor('ram', bench?.ram ?? null, rebaselineTimes_ms(vehicle.maintenance, 'ram'), o),
    fan: new BandMonitor('fan', bench?.fan ?? null, rebaselineTimes_ms(vehicle.maintenance, 'fan'), o),
  };
  const basis = designBand(vehicle);
  const th = marginThresholds(p, vehicle.coolant_limit_c, vehicle.design.ambient_c);
  const lat = (m: number | null) =>
    m === null ? null : latForMargin_c(m, vehicle.coolant_limit_c, vehicle.design.ambient_c);
  const machine = new StatusMachine(th, p);
  const evidence = new EvidenceTracker(vehicle.maintenance, o);
  // Valid design-point margins in time order: epoch ms (ascending) and %.
  const marginMs: number[] = [];
  const marginV: number[] = [];
  const asymptotic = asymptoticLevels(marginMs, marginV);
  const n = trips.length;
  const out: TripHealth[] = new Array(n);
  const marginLevel = new Array<number | null>(n).fill(null);
  const alerts: Alert[] = [];
  let candidates: Candidate[] = [];
  let cause = pickCause(
    rankCauses(bands.ram.summary(), bands.fan.summary(), evidence.read(), o, minDrop),
    o.cause_min_score,
  );
  let status = 'ok' as Status;
  let warning = null as string | null;
  let warned = false;
  let alertedCause: Cause = 'none';
  let inspectSince = null as string | null;

  order.forEach((i, j) => {
    const t = trips[i]!;
    const ms = times[i]!;
    const flagged = t.sensor_flags.length > 0;
    bands.ram.push(j, ms, flagged ? null : t.k_ram_w_m2k);
    bands.fan.push(j, ms, flagged ? null : t.k_fan_w_m2k);
    evidence.push(t, ms);
    if (!flagged && t.margin_pct !== null && t.margin_basis === basis) {
      marginMs.push(ms);
      marginV.push(t.margin_pct);
    }
    const ram = bands.ram.summary();
    const fan = bands.fan.summary();
    const primary = basis === 'ram' ? ram : fan;
    const from = lowerBound(marginMs, primary.segment_start_ms);
    const segFrom = from + tailStart(marginMs.length - from, o.level_window_trips);
    const level =
      marginMs.length - segFrom >= o.min_level_trips
        ? currentLevel(
            marginMs.slice(segFrom).map((v) => v / DAY_MS),
            marginV.slice(segFrom),
            primary.alarm,
          )
        : null;
    const m =
      level && primary.alarm ? (asymptotic(primary.period_start_ms) ?? level.value) : (level?.value ?? null);
    marginLevel[i] = m;
    candidates = rankCauses(ram, fan, evidence.read(), o, minDrop, () =>
      fanStep(bands.fan, bands.ram, fan.reference, ram.reference, o.min_level_trips),
    );
    const c = pickCause(candidates, o.cause_min_score);
    const sensorSuspect = c.cause === 'sensor';
    const fallen = (drop: number) =>
      [ram, fan].some((b) => b.alarm && (b.drop ?? 0) >= drop && fallZ(b) >= 2);
    const step = machine.step({
      margin_pct: m,
      health: [ram.level?.value ?? null, fan.level?.value ?? null],
      detected_drop: fallen(minDrop),
      detected_drop_held: fallen(minDrop - p.hysteresis_margin_pct / 100),
      sensor_suspect: sensorSuspect,
      coolant_suspect: c.cause === 'coolant_flow',
      margin_falling: (level?.slope_per_day ?? 0) < 0,
    });
    warning = sensorSuspect
      ? improvementWarning(
          firstSince(marginMs, marginV, primary.period_start_ms, o.baseline_trips),
          m,
          o.baseline_trips,
          p.hysteresis_margin_pct,
        )
      : null;
    const time = t.end;
    if (step.status === 'inspect' && step.changed) inspectSince = time;
    if (step.changed || (step.status !== 'ok' && c.cause !== 'none' && c.cause !== alertedCause)) {
      alertedCause = c.cause;
      const because = step.reasons.length ? step.reasons.join('; ') : 'levels back inside the thresholds';
      const detail = `${step.status}: ${because}${c.cause === 'none' ? '' : `; likely ${CAUSE_WORD[c.cause]}: ${c.evidence}`}`;
      alerts.push({
        time,
        status: step.status,
        cause: c.cause,
        detail: warning ? `${detail}; ${warning}` : detail,
      });
      if (warning) warned = true;
    }
    if (warning && !warned) {
      alerts.push({ time, status: step.status, cause: c.cause, detail: warning });
      warned = true;
    }
    status = step.status;
    cause = c;
    out[i] = { health_ram: null, health_fan: null, status };
  });
  // Health per trip is read after the loop: the first trips' health is known once their baseline is.
  for (const b of ['ram', 'fan'] as const) {
    for (const q of bands[b].points)
      out[order[q.trip]!]![b === 'ram' ? 'health_ram' : 'health_fan'] = q.health;
  }

  const ram = bands.ram.summary();
  const fan = bands.fan.summary();
  const notes: string[] = [];
  for (const b of [ram, fan]) {
    if (!b.level) {
      notes.push(`${b.band} band reached on ${b.valid_trips} of ${n} trips: ${b.band} health not judged`);
    }
  }
  const primary = basis === 'ram' ? ram : fan;
  // A trend is projected over the whole history since the re-baseline, not only since a change point.
  const since = lowerBound(marginMs, primary.period_start_ms);
  const lastMargin = n ? marginLevel[order[n - 1]!]! : null;
  if (lastMargin === null) {
    notes.push(
      `margin not judged: the design point's ${basis} band gave a margin on ${marginMs.length} of ${n} trips`,
    );
  }
  if (!trips.some((t) => t.coolant_dt_per_kw !== null))
    notes.push('no radiator outlet temperature: coolant flow cannot be confirmed');
  const proj = projectMargin(
    marginMs.slice(since).map((v) => v / DAY_MS),
    marginV.slice(since),
    th.inspect_enter,
    o,
  );
  const dueSince = status === 'inspect' ? inspectSince : null;
  if (dueSince) notes.push(`inspection due since ${dueSince.slice(0, 10)}`);
  else if (proj.reason && lastMargin !== null) notes.push(`no inspection date projected: ${proj.reason}`);
  if (warning) notes.push(warning);

  let causeEvidence = cause.evidence;
  if (cause.cause === 'none' && (!ram.level || !fan.level || lastMargin === null)) {
    causeEvidence = `not enough data to judge every band: ${notes.join('; ')}`;
  }
  if (warning && !causeEvidence.includes(warning)) causeEvidence = `${causeEvidence}; ${warning}`;

  return {
    health: { ram: ram.level?.value ?? null, fan: fan.level?.value ?? null },
    status,
    cause: cause.cause,
    cause_evidence: causeEvidence,
    projected_inspect_date: dueSince ?? isoOfDay(proj.cross_day),
    alerts,
    trips: out,
    candidates,
    notes,
    series: {
      time_ms: [...times],
      ram: bandSeries(bands.ram, order, o),
      fan: bandSeries(bands.fan, order, o),
      margin: {
        basis,
        pct: trips.map((t) => t.margin_pct),
        level_pct: marginLevel,
        lat_c: trips.map((t) => t.limiting_ambient_c),
        lat_level_c: marginLevel.map(lat),
        inspect_below_pct: th.inspect_enter,
        watch_below_pct: th.watch_enter,
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
    },
  };
}

/**
 * Of the fan band's changes since its baseline, the one that took most from the fan band alone: each
 * band's level just before the change against the median of its trips since (a windowed level lags).
 * `f`, `r`: the bands' references.
 */
function fanStep(
  fan: BandMonitor,
  ram: BandMonitor,
  f: number | null,
  r: number | null,
  min_trips: number,
): FanStep | null {
  if (f === null || r === null) return null;
  let best: FanStep | null = null;
  for (const c of fan.periodChanges()) {
    const fanSince = fan.healthSince(c.since_ms, min_trips);
    if (c.level_before === null || fanSince === null) continue;
    const before = ram.levelBefore(c.since_ms);
    const since = ram.healthSince(c.since_ms, min_trips);
    const step: FanStep = {
      since_ms: c.since_ms,
      fall: (c.level_before - fanSince) / f,
      ram_fall: before === null || since === null ? null : (before - since) / r,
    };
    const lead = (x: FanStep) => x.fall - FAN_OVER_RAM * Math.max(0, x.ram_fall ?? Number.POSITIVE_INFINITY);
    if (best === null || lead(step) > lead(best)) best = step;
  }
  return best;
}

/** trips: fewest since the re-baseline for a Kern–Seaton level. */
const MIN_ASYMPTOTIC_TRIPS = 20;

/**
 * While the detectors say the margin moves, its level from the Kern–Seaton fit since the last
 * re-baseline (all of that history, where a windowed line has only its last trips); null when the fit
 * shows no levelling off or the history is short. Reads the margins as they grow (`ms` ascending); a
 * trip that adds no margin asks for the same fit again, which is kept.
 */
function asymptoticLevels(ms: readonly number[], v: readonly number[]): (from_ms: number) => number | null {
  let key = '';
  let kept: number | null = null;
  return (from_ms) => {
    const since = lowerBound(ms, from_ms);
    const from = since + tailStart(ms.length - since, MAX_TRIPS);
    const k = `${from}:${ms.length}`;
    if (k === key) return kept;
    key = k;
    kept = null;
    if (ms.length - from < MIN_ASYMPTOTIC_TRIPS) return kept;
    const t = ms.slice(from).map((x) => x / DAY_MS);
    const fit = fitAsymptotic(t, v.slice(from));
    kept = fit ? fit.at(t[t.length - 1]!) : null;
    return kept;
  };
}

/** The first `n` values at or after `from_ms` (`ms` ascending). */
function firstSince(ms: readonly number[], v: readonly number[], from_ms: number, n: number): number[] {
  const since = lowerBound(ms, from_ms);
  return v.slice(since, since + headEnd(v.length - since, n));
}

/**
 * A sensor suspect while the margin reads better than after the last re-baseline: say the improvement
 * is not credible (an ambient reading high makes ITD smaller, so k and margin look better).
 * `since`: the margins since the re-baseline, in time order.
 */
function improvementWarning(
  since: readonly number[],
  level: number | null,
  N: number,
  deadband: number,
): string | null {
  const first = since.slice(0, N);
  if (level === null || first.length < N) return null;
  const before = median(first);
  if (!(level > before + deadband)) return null;
  return `warning: margin reads ${level.toFixed(1)} % against ${before.toFixed(1)} % earlier, but a sensor is suspect, so the improvement is not credible`;
}
