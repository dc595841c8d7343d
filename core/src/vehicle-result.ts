import type { MaintenanceEntry, Trend, TripResult, VehicleResult } from '@thermargin/shared';
import { assessVehicle, type HealthOptions, type VehicleAssessment } from './health/assess.ts';
import type { VehicleModel } from './vehicle/resolve.ts';

export interface VehicleOutcome {
  /** The contract's vehicle result: trips (input order) with health_ram/health_fan/status merged. */
  result: VehicleResult;
  /** Everything the health module gave (series for charts, notes, candidates). */
  assessment: VehicleAssessment;
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
  const a = assessVehicle(vehicle, trips, options);
  return {
    result: {
      id: vehicle.id,
      trips: trips.map((t, i) => ({ ...t, ...a.trips[i]! })),
      health: a.health,
      status: a.status,
      cause: a.cause,
      cause_evidence: a.cause_evidence,
      projected_inspect_date: a.projected_inspect_date,
      alerts: a.alerts,
    },
    assessment: a,
  };
}

/** The vehicle with maintenance entries added to its log (e.g. entered through the API), sorted by date. */
export function withMaintenance(vehicle: VehicleModel, extra: readonly MaintenanceEntry[]): VehicleModel {
  if (extra.length === 0) return vehicle;
  const maintenance = [...vehicle.maintenance, ...extra].sort((a, b) => a.date.localeCompare(b.date));
  return { ...vehicle, maintenance };
}

/** trips, 10 and % points, 1 (our choice): the trend compares the margin level this many trips back. */
export const TREND_DEFAULTS = { trips: 10, deadband_pct: 1 } as const;

/**
 * The vehicle's current margin and limiting ambient (the health module's levels at its latest trip)
 * and their direction: the level now against the level `trips` valid trips earlier, beyond a deadband.
 */
export function marginNow(
  a: Pick<VehicleAssessment, 'series'>,
  o: typeof TREND_DEFAULTS = TREND_DEFAULTS,
): { margin_pct: number | null; limiting_ambient_c: number | null; trend: Trend | null } {
  const m = a.series.margin;
  const order = a.series.time_ms.map((_, i) => i).sort((x, y) => a.series.time_ms[x]! - a.series.time_ms[y]!);
  const levels = order.map((i) => m.level_pct[i]!).filter((v): v is number => v !== null);
  const last = order.at(-1);
  const margin = last === undefined ? null : m.level_pct[last]!;
  const lat = last === undefined ? null : m.lat_level_c[last]!;
  let trend: Trend | null = null;
  if (margin !== null && levels.length > o.trips) {
    const d = margin - levels[levels.length - 1 - o.trips]!;
    trend = d < -o.deadband_pct ? 'falling' : d > o.deadband_pct ? 'rising' : 'steady';
  }
  return { margin_pct: margin, limiting_ambient_c: lat, trend };
}
