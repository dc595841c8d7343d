import type { Cause } from '@thermargin/shared';
import type { BandSummary } from './band-monitor.ts';
import type { Evidence } from './cause-evidence.ts';
import type { HealthOptions } from './options.ts';

/**
 * –, 3: a fan fault takes k from the fan band alone, while fouling, the coolant side and a biased sensor
 * take at least as much from the ram band: a fan band falling 3× more than the ram band from the same
 * time on points at the fan (our choice).
 */
export const FAN_OVER_RAM = 3;

/** A change of the fan band against the ram band over the same trips (falls of k, as fractions). */
export interface FanStep {
  since_ms: number;
  /** Fan-band level just before the change less the median of its trips since, over its reference. */
  fall: number;
  /** The same for the ram band from the same time on; null when it was not driven before and since. */
  ram_fall: number | null;
}

export interface Candidate {
  cause: Cause;
  /** 0–1: how well the evidence fits this cause (our weighting, documented below). */
  score: number;
  evidence: string;
}

/** –: fan-band fall over ram-band fall at and above which both bands count as fallen alike (our choice). */
const ALIKE = 0.85;

const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** ms, one day: a change estimated to start this much before the first failing soak check still goes with it. */
const SOAK_SLACK_MS = 86_400_000;

/** z of a band's fall: (reference − level) / (σ · se factor). */
export function fallZ(b: BandSummary): number {
  if (!b.level || b.reference === null) return 0;
  return (b.reference - b.level.value) / (b.sigma * b.level.se_per_sigma);
}

/** A band has fallen: by at least `minDrop` and beyond noise (a detector signals, or z ≥ 3). */
function fell(b: BandSummary, minDrop: number): boolean {
  return b.drop !== null && b.drop >= minDrop && (b.alarm || fallZ(b) >= 3);
}

function held(b: BandSummary, minDrop: number): boolean {
  return b.drop !== null && b.drop < minDrop && !b.alarm;
}

function describe(b: BandSummary): string {
  if (b.drop === null) return `${b.band}-band k not judged (${b.valid_trips} trips in the band)`;
  const d = b.drop >= 0 ? `${pct(b.drop)} below` : `${pct(-b.drop)} above`;
  return `${b.band}-band k ${d} its reference`;
}

/** Rising by a relative `rise` (null when either side is missing). */
function rose(
  s: { baseline: number | null; recent: number | null },
  rise: number,
  absolute: boolean,
): boolean | null {
  if (s.baseline === null || s.recent === null) return null;
  return absolute ? s.recent - s.baseline >= rise : s.recent >= s.baseline * (1 + rise);
}

/** What each cause's rule reads: the bands, the evidence, the options and the policy's watch drop. */
interface Signs {
  ram: BandSummary;
  fan: BandSummary;
  ev: Evidence;
  o: HealthOptions;
  minDrop: number;
}

/**
 * Ranks the causes the evidence supports (docs/operating-bands.md, "What each band shows"). Scores are our own
 * weighting, meant only to order candidates: the main sign of a cause gives 0.5–0.6, each
 * corroborating sign adds 0.15–0.3. A suspect sensor removes fouling and coolant flow from the list:
 * a biased ambient or coolant reading moves k in both bands, and the radiator must not take the blame.
 */
export function rankCauses(
  ram: BandSummary,
  fan: BandSummary,
  ev: Evidence,
  o: HealthOptions,
  minDrop: number,
  /** Read only when the fan band has fallen (it searches the band's history). */
  fanStep: () => FanStep | null = () => null,
): Candidate[] {
  const s: Signs = { ram, fan, ev, o, minDrop };
  const sensor = sensorCandidate(s);
  const out: Candidate[] = [];
  if (sensor.candidate) out.push(sensor.candidate);
  const fanFault = fanCandidate(s, sensor.withRun, fanStep);
  if (fanFault) out.push(fanFault);
  if (!sensor.suspect) out.push(...coolantSideCandidates(s));
  const top = Math.max(0, ...out.map((c) => c.score));
  out.push({ cause: 'none', score: Math.max(0, 1 - top), evidence: 'no change beyond trip-to-trip noise' });
  return out
    .map((c) => ({ ...c, score: Math.min(1, Math.max(0, c.score)) }))
    .sort((a, b) => b.score - a.score);
}

/**
 * A biased or stuck sensor: soak checks at key-on beyond tolerance, sensor flags held, or a band fall
 * that began with the soak checks failing on the side that makes k look smaller. `withRun`: the bands
 * whose fall that run explains.
 */
function sensorCandidate({ ram, fan, ev, o, minDrop }: Signs): {
  candidate: Candidate | null;
  suspect: boolean;
  withRun: BandSummary[];
} {
  const parts: string[] = [];
  let score = 0;
  if (ev.soak.hits >= o.soak_min_hits) {
    score = 0.9;
    const side = ev.soak.sign < 0 ? 'below' : 'above';
    parts.push(
      `at key-on after a long stop the coolant read ${Math.abs(ev.soak.median_k ?? 0).toFixed(1)} K ${side} ambient on ${ev.soak.hits} of the last ${ev.soak.checks} cold starts (a soaked loop reads ambient within ${o.soak_tolerance_k} K)`,
    );
    if (ev.soak.sign < 0 && ((ram.drop ?? 0) < 0 || (fan.drop ?? 0) < 0)) {
      parts.push(
        'k reads higher than its reference, as an ambient sensor reading high makes it (smaller ITD)',
      );
    }
  }
  if (ev.flags.held) {
    score = Math.max(score, 0.7);
    const held =
      ev.flags.flagged / ev.flags.trips < o.sensor_flag_share
        ? `, and on ≥ ${pct(o.sensor_flag_share)} of ${o.sensor_flag_window} trips earlier with no clean run of ${o.sensor_flag_window} since`
        : '';
    const examples = ev.flags.examples.length ? ` (${ev.flags.examples.join('; ')})` : '';
    parts.push(
      `implausible signals on ${ev.flags.flagged} of the last ${ev.flags.trips} trips${examples}${held}`,
    );
  }
  // Coolant above ambient at key-on (ambient reading low, or coolant high) makes ITD look larger and k
  // smaller: a fall that began with the soak checks failing so (after the last check before them, or at
  // most a day before the first of them) is the sensor's until they say otherwise.
  const run = ev.soak.run;
  const withRun = [ram, fan].filter(
    (b) =>
      run?.sign === 1 &&
      fell(b, minDrop) &&
      (b.segment_start_ms >= run.since_ms - SOAK_SLACK_MS ||
        (run.previous_ms !== null && b.segment_start_ms > run.previous_ms)),
  );
  // 0.75: above a fan fault seen in the fan band alone (0.7), below one the holding ram band confirms.
  if (run && withRun.length && score < 0.75) {
    score = 0.75;
    parts.push(
      `${withRun.map(describe).join(' and ')} since ${isoDay(withRun[0]!.segment_start_ms)}, when the soak check began failing: at key-on the coolant read more than ${o.soak_tolerance_k} K above ambient on the last ${run.checks} cold start${run.checks === 1 ? '' : 's'}, as an ambient sensor reading low (or a coolant sensor reading high) makes k look smaller`,
    );
  }
  const suspect = score >= o.cause_min_score;
  if (suspect) parts.push('radiator and coolant flow not judged while a sensor is suspect');
  return {
    candidate: score > 0 ? { cause: 'sensor', score, evidence: parts.join('; ') } : null,
    suspect,
    withRun,
  };
}

/**
 * The fan band fallen alone: the ram band holding since, or a step of the fan band at least
 * FAN_OVER_RAM times the ram band's over the same trips, or far more than the ram band; a fan more
 * often at full duty corroborates.
 */
function fanCandidate(
  { ram, fan, ev, o, minDrop }: Signs,
  withRun: readonly BandSummary[],
  fanStep: () => FanStep | null,
): Candidate | null {
  if (!fell(fan, minDrop)) return null;
  let score: number;
  let text: string;
  // The ram band only speaks for the fan if it was driven since the fan band fell.
  const ramSince = ram.last_ms !== null && ram.last_ms >= fan.segment_start_ms;
  // On a core already fouling the ram band has fallen too: what tells is what fell at the fan's change.
  // Unless the fall came with the soak check failing: then the sensor explains it as well.
  const step = withRun.includes(fan) ? null : fanStep();
  const stepped =
    step !== null &&
    step.fall >= minDrop &&
    step.ram_fall !== null &&
    step.fall >= FAN_OVER_RAM * step.ram_fall;
  if (ramSince && held(ram, minDrop)) {
    score = 0.6;
    text = `${describe(fan)} while the ${describe(ram)}`;
  } else if (stepped) {
    score = 0.6;
    text = `fan-band k fell ${pct(step!.fall)} from ${isoDay(step!.since_ms)} on, while the ram-band k moved ${pct(step!.ram_fall!)} over the same trips (${describe(fan)}; ${describe(ram)})`;
  } else if (ram.drop === null || !ramSince) {
    // Unconfirmed: with the fan at full duty more often (0.6) it is named when nothing else is, but
    // ranks below fouling that the ram band's own fall shows (≥ 0.65 while that fall goes on), since a
    // fouling core saturates the fan as well (a tie would leave it to the list's order).
    score = 0.3;
    text = `${describe(fan)}; the ram band was not reached since, so fouling, a coolant-side loss or a biased temperature sensor cannot be ruled out`;
  } else if (fan.drop! > 2 * ram.drop + minDrop) {
    score = 0.45;
    text = `${describe(fan)}, far more than the ${describe(ram)}`;
  } else return null;
  const sat = rose(ev.saturation, o.fan_saturation_rise, true);
  const satText =
    ev.saturation.recent !== null && ev.saturation.baseline !== null
      ? `fan at full duty ${pct(ev.saturation.recent)} of the time against ${pct(ev.saturation.baseline)} before`
      : 'fan duty history too short';
  if (sat) score += 0.3;
  return { cause: 'fan', score, evidence: `${text}; ${satText}` };
}

/**
 * Fouling and a coolant-side loss, judged only while no sensor is suspect. Fouling takes most from ram
 * air (the fan band keeps more than 15 % of the ram band's fall back); both bands down about alike
 * looks like a coolant-side loss (pump, air in the loop, a thermostat not fully open) too, which only a
 * radiator temperature drop per kW rising at the same heat tells apart.
 */
function coolantSideCandidates({ ram, fan, ev, o, minDrop }: Signs): Candidate[] {
  const out: Candidate[] = [];
  const dtRose = rose(ev.coolant_dt, o.coolant_dt_rise, false);
  const alike =
    ram.drop !== null &&
    fan.drop !== null &&
    fell(ram, minDrop) &&
    fan.drop >= ALIKE * ram.drop &&
    fan.drop <= 1.5 * ram.drop + minDrop;
  if (fell(ram, minDrop)) {
    let score = 0.5;
    const parts = [describe(ram)];
    if (fan.drop !== null && fan.drop >= 0.2 * ram.drop! && fan.drop <= 1.5 * ram.drop! + minDrop) {
      score += alike ? 0.05 : 0.2;
      parts.push(`${describe(fan)}: both bands, ${alike ? 'fan about as much' : 'most in ram'}`);
    } else parts.push(describe(fan));
    if (
      ram.level?.slope_per_day !== null &&
      ram.level?.slope_per_day !== undefined &&
      ram.level.slope_per_day < 0
    ) {
      // The rate is the margin's, quoted once beside the finding (trend.ts), not this band's own.
      score += 0.15;
      parts.push('ram-band k still falling');
    }
    if (dtRose) score -= 0.3;
    out.push({ cause: 'fouling', score, evidence: parts.join('; ') });
  }
  if (dtRose) {
    const both = fell(ram, minDrop) || fell(fan, minDrop);
    const b = ev.coolant_dt.baseline!;
    const r = ev.coolant_dt.recent!;
    out.push({
      cause: 'coolant_flow',
      score: 0.5 + (both ? 0.3 : 0),
      evidence: `radiator temperature drop per kW up ${pct(r / b - 1)} (${b.toFixed(3)} → ${r.toFixed(3)} K/kW) at the same heat${both ? `; ${describe(ram)}, ${describe(fan)}` : ''}`,
    });
  }
  if (alike && ev.coolant_dt.baseline === null) {
    out.push({
      cause: 'coolant_flow',
      score: 0.45,
      evidence: `${describe(ram)} and ${describe(fan)}: both bands about alike, as a coolant-side loss would make them; no radiator outlet temperature to confirm it`,
    });
  }
  return out;
}
