import type { MaintenanceEntry, Trend, TripResult, VehicleResult } from '@thermargin/shared';
import { assessVehicle, type HealthOptions, type VehicleAssessment } from './health/assess.ts';
import { ESTIMATOR_DEFAULTS } from './trip/estimator-options.ts';
import { learnedFields, learnVehicle } from './vehicle/learn.ts';
import type { VehicleModel } from './vehicle/resolve.ts';

export interface VehicleOutcome {
  /** The contract's vehicle result: trips (input order) with health_ram/health_fan/status merged. */
  result: VehicleResult;
  /** Everything the health module gave (series for charts, notes, candidates). */
  assessment: VehicleAssessment;
  /** The vehicle as the vehicle stage learned it (air side, unmeasured heat): what its figures rest on. */
  learned: VehicleModel;
}

/**
 * A trip shorter than one estimation window (a sample or two published by hand, a logger's blip) has no
 * window to estimate k from and says nothing of the cooling: it is listed, never judged.
 */
export function isTooShort(t: Pick<TripResult, 'start' | 'end'>): boolean {
  return Date.parse(t.end) - Date.parse(t.start) < ESTIMATOR_DEFAULTS.window_s * 1000;
}

/**
 * The one place that turns a vehicle's trip results into its full VehicleResult: the offline CLI and the
 * analyzer service both call it, so their outputs agree exactly.
 */
export function vehicleResult(
  vehicle: VehicleModel,
  trips: readonly TripResult[],
  options: Partial<HealthOptions> = {},
): VehicleOutcome {
  const judged = trips.filter((t) => !isTooShort(t));
  const l = learnVehicle(vehicle, judged);
  const a = assessVehicle(l.vehicle, l.trips, options);
  const now = marginNow(a);
  let j = 0;
  return {
    result: {
      id: vehicle.id,
      trips: trips.map((t) =>
        isTooShort(t) ? { ...t, too_short: true } : { ...l.trips[j]!, ...a.trips[j++]! },
      ),
      // Only too-short trips: nothing judged, the vehicle stays unassessed.
      ...(judged.length === 0
        ? {}
        : {
            health: a.health,
            status: a.status,
            cause: a.cause,
            cause_evidence: a.cause_evidence,
            projected_inspect_date: a.projected_inspect_date,
            projected_inspect_overdue_days: a.projected_inspect_overdue_days,
            margin_pct: now.margin_pct,
            limiting_ambient_c: now.limiting_ambient_c,
            margin_basis: a.series.margin.basis,
            trend: now.trend,
            trend_pct_per_30d: now.trend_pct_per_30d,
            alerts: a.alerts,
            ...learnedFields(l),
          }),
    },
    assessment: a,
    learned: l.vehicle,
  };
}

/** The vehicle with maintenance entries added to its log (e.g. entered through the API), sorted by date. */
export function withMaintenance(vehicle: VehicleModel, extra: readonly MaintenanceEntry[]): VehicleModel {
  if (extra.length === 0) return vehicle;
  const maintenance = [...vehicle.maintenance, ...extra].sort((a, b) => a.date.localeCompare(b.date));
  return { ...vehicle, maintenance };
}

/**
 * The vehicle's current margin and limiting ambient (the health module's levels at its latest trip)
 * and their trend: the one trend of the margin since the governing band's last change (health/trend.ts),
 * which the finding and the alerts quote too. Results stored before the trend was kept read no trend.
 */
export function marginNow(a: Pick<VehicleAssessment, 'series'>): {
  margin_pct: number | null;
  limiting_ambient_c: number | null;
  trend: Trend | null;
  trend_pct_per_30d: number | null;
} {
  const m = a.series.margin;
  let last: number | undefined;
  a.series.time_ms.forEach((t, i) => {
    if (last === undefined || t >= a.series.time_ms[last]!) last = i;
  });
  const trend = m.trend ?? null;
  return {
    margin_pct: last === undefined ? null : m.level_pct[last]!,
    limiting_ambient_c: last === undefined ? null : m.lat_level_c[last]!,
    trend: trend?.word ?? null,
    trend_pct_per_30d: trend?.pct_per_30d ?? null,
  };
}
