import type { Cause, Status } from '@thermargin/shared';
import type { VehicleAssessment } from '@thermargin/core/health/assess';
import type { Scenario } from './generate.ts';

const RANK: Record<Status, number> = { ok: 0, watch: 1, inspect: 2 };

/** First trip index ≥ from where `pred` holds, or null. */
export function firstTrip(n: number, from: number, pred: (i: number) => boolean): number | null {
  for (let i = from; i < n; i++) if (pred(i)) return i;
  return null;
}

/** Trip index of each alert (alerts carry the trip's end time). */
export function alertTrips(
  s: Scenario,
  a: VehicleAssessment,
): { trip: number; status: Status; cause: Cause }[] {
  const byEnd = new Map(s.trips.map((t, i) => [t.end, i]));
  return a.alerts.map((al) => ({ trip: byEnd.get(al.time)!, status: al.status, cause: al.cause }));
}

/** First trip at or after `from` whose alert names `cause`. */
export function firstCause(s: Scenario, a: VehicleAssessment, cause: Cause, from: number): number | null {
  return alertTrips(s, a).find((x) => x.trip >= from && x.cause === cause)?.trip ?? null;
}

/** Status raises (to a worse state) on trips whose true state was ok: false alarms. */
export function falseAlarms(s: Scenario, a: VehicleAssessment): number {
  let n = 0;
  for (let i = 1; i < a.trips.length; i++) {
    if (RANK[a.trips[i]!.status] > RANK[a.trips[i - 1]!.status] && s.truth[i]!.status === 'ok') n++;
  }
  return n;
}

/** Episodes (runs) of a status. */
export function episodes(a: VehicleAssessment, status: Status): number {
  let n = 0;
  a.trips.forEach((t, i) => {
    if (t.status === status && (i === 0 || a.trips[i - 1]!.status !== status)) n++;
  });
  return n;
}

export function dayOf(s: Scenario, i: number | null): number | null {
  return i === null ? null : s.truth[i]!.day + (Date.parse(s.trips[i]!.start) % 86_400_000) / 86_400_000;
}

export const firstStatus = (a: VehicleAssessment, at: Status, from = 0) =>
  firstTrip(a.trips.length, from, (i) => RANK[a.trips[i]!.status] >= RANK[at]);
export const firstTrueStatus = (s: Scenario, at: Status, from = 0) =>
  firstTrip(s.truth.length, from, (i) => RANK[s.truth[i]!.status] >= RANK[at]);
export const firstDay = (s: Scenario, day: number) =>
  firstTrip(s.truth.length, 0, (i) => s.truth[i]!.day >= day);
