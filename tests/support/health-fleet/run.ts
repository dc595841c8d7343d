import { assessVehicle, type VehicleAssessment } from '@thermargin/core/health/assess';
import { generateScenario, type Scenario, type ScenarioParams } from './generate.ts';
import {
  alertTrips,
  dayOf,
  episodes,
  falseAlarms,
  firstCause,
  firstDay,
  firstStatus,
  firstTrip,
  firstTrueStatus,
} from './metrics.ts';
import { EVENT_DAY, type ScenarioName, type SetName, scenarioParams } from './scenarios.ts';

/** Detection figures of one run, for the tests and for the closing note. */
export interface RunFigures {
  set: SetName;
  scenario: ScenarioName;
  seed: number;
  trips: number;
  /** Detection delay in trips and days against the true event or crossing (negative: early). */
  delay_trips: number | null;
  delay_days: number | null;
  /** Second figure where a scenario has two (fouling: watch then inspect; fan: fan-band trips). */
  detail: string;
  false_alarms: number;
}

export interface Run {
  s: Scenario;
  a: VehicleAssessment;
  f: RunFigures;
}

const d = (s: Scenario, got: number | null, ref: number | null) =>
  got === null || ref === null ? null : Number((dayOf(s, got)! - dayOf(s, ref)!).toFixed(1));

/** `change`: parameters that differ from the set's (the report's noise sweep). */
export function run(
  set: SetName,
  scenario: ScenarioName,
  seed: number,
  change: Partial<ScenarioParams> = {},
): Run {
  const s = generateScenario({ ...scenarioParams(set, scenario, seed), ...change });
  const a = assessVehicle(s.vehicle, s.trips);
  const n = s.trips.length;
  let delay: number | null = null;
  let delayDays: number | null = null;
  let detail = '';
  const base = { set, scenario, seed, trips: n, false_alarms: falseAlarms(s, a) };
  if (scenario === 'fouling') {
    const tw = firstTrueStatus(s, 'watch');
    const ti = firstTrueStatus(s, 'inspect');
    const gw = firstStatus(a, 'watch');
    const gi = firstStatus(a, 'inspect');
    delay = gi === null || ti === null ? null : gi - ti;
    delayDays = d(s, gi, ti);
    detail = `watch ${gw === null || tw === null ? 'never' : `${gw - tw} trips / ${d(s, gw, tw)} d`} vs true; inspect cause ${gi === null ? '-' : alertTrips(s, a).find((x) => x.trip === gi)?.cause}`;
  } else if (scenario === 'fan' || scenario === 'fouled_fan') {
    const ev = firstDay(s, EVENT_DAY[scenario])!;
    const got = firstCause(s, a, 'fan', ev);
    delay = got === null ? null : s.truth.slice(ev, got + 1).filter((t) => t.fan_data).length;
    delayDays = d(s, got, ev);
    detail = `delay counted in trips with fan-band data; ram health at end ${a.health.ram?.toFixed(3)}; final cause ${a.cause}`;
  } else if (scenario === 'sensor' || scenario === 'sensor_low') {
    const ev = firstDay(s, EVENT_DAY[scenario])!;
    const got = firstCause(s, a, 'sensor', ev);
    delay = got === null ? null : s.truth.slice(ev, got + 1).filter((t) => t.cold_start).length;
    delayDays = d(s, got, ev);
    detail = 'delay counted in cold starts';
  } else if (scenario === 'flags' || scenario === 'coolant') {
    const ev = firstDay(s, EVENT_DAY[scenario])!;
    const want = scenario === 'flags' ? 'sensor' : 'coolant_flow';
    const got = firstCause(s, a, want, ev);
    delay = got === null ? null : got - ev;
    delayDays = d(s, got, ev);
    detail = `trips from the fault to cause ${want}; final cause ${a.cause}`;
  } else if (scenario === 'cleaning') {
    const ev = firstDay(s, EVENT_DAY.cleaning)!;
    const got = firstTrip(n, ev, (i) => a.trips[i]!.status === 'ok');
    delay = got === null ? null : got - ev;
    delayDays = d(s, got, ev);
    detail = 'trips from the cleaning to status ok';
  } else if (scenario === 'healthy') {
    detail = `watch episodes ${episodes(a, 'watch')}, inspect episodes ${episodes(a, 'inspect')}`;
  } else detail = a.notes.join(' | ');
  return { s, a, f: { ...base, delay_trips: delay, delay_days: delayDays, detail } };
}
