import {
  ALERT_SELF_CLOSER,
  type AlertView,
  type HealthSeriesView,
  type MaintenanceView,
  type TripResult,
  type VehicleResult,
  type VehicleSummary,
} from '@thermargin/shared';
import type { StoredAnalysis } from '@thermargin/store/analysis';
import type { AlertAction, RecordedMaintenance } from '@thermargin/store/workflow';
import type { VehicleAssessment } from '@thermargin/core/health/assess';
import { tripIdFromTime } from '@thermargin/core/trip/split';
import { overdueDays } from '@thermargin/core/health/due';
import { marginNow } from '@thermargin/core/vehicle-result';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';

/** What the analyzer stored beside the VehicleResult (see services/usecases/src/commit.ts). */
export type StoredAssessment = Pick<VehicleAssessment, 'series' | 'notes' | 'candidates'>;
// Compile-time check that the contract's series schema matches what the core gives.
const _seriesMatches = (s: VehicleAssessment['series']): HealthSeriesView => s;
void _seriesMatches;

/** One vehicle's stored results, as read once per version. */
export interface VehicleData {
  version: number;
  result: VehicleResult;
  analysis: StoredAnalysis;
  assessment: StoredAssessment;
  /** Trips newest first. */
  newest_first: TripResult[];
}

/** Alert ids: the alert's time in compact form and its status; a repeat at the same time gets `-2`, `-3`. */
export function alertViews(
  vehicle: string,
  r: VehicleResult | undefined,
  actions: readonly AlertAction[],
): AlertView[] {
  const seen = new Map<string, number>();
  const list = r?.alerts ?? [];
  return list.map((a, i) => {
    const base = `${tripIdFromTime(Date.parse(a.time))}-${a.status}`;
    const k = (seen.get(base) ?? 0) + 1;
    seen.set(base, k);
    const id = k === 1 ? base : `${base}-${k}`;
    let acknowledged: AlertView['acknowledged'] = null;
    let closed: AlertView['closed'] = null;
    for (const x of actions) {
      if (x.alert !== id) continue;
      const stamp = { by: x.by, at: new Date(x.at_ms).toISOString(), note: x.note };
      if (x.action === 'acknowledge') acknowledged = stamp;
      else closed = stamp;
    }
    closed ??= closedByItself(a, list[i + 1]);
    const state = closed ? 'closed' : acknowledged ? 'acknowledged' : 'open';
    return { id, vehicle, ...a, state, acknowledged, closed };
  });
}

type StoredAlert = NonNullable<VehicleResult['alerts']>[number];

/**
 * The closing stamp of an alert no person has to act on: a return to ok (nothing to acknowledge), or one
 * a later alert of the same vehicle has replaced (the newer one says where the vehicle stands now).
 */
function closedByItself(a: StoredAlert, next: StoredAlert | undefined): AlertView['closed'] {
  if (a.status === 'ok')
    return { by: ALERT_SELF_CLOSER, at: a.time, note: 'back inside the thresholds: nothing to acknowledge' };
  if (!next) return null;
  return {
    by: ALERT_SELF_CLOSER,
    at: next.time,
    note:
      next.status === 'ok'
        ? 'superseded: the vehicle went back to ok'
        : `superseded by the ${next.status} alert of ${next.time.slice(0, 16).replace('T', ' ')} UTC`,
  };
}

export const isOpenAlert = (a: AlertView) => a.status !== 'ok' && a.state !== 'closed';

/** The fleet file's log (fleet-1…) and the entries added through the API (api-<n>), by date. */
export function maintenanceViews(
  model: VehicleModel,
  added: readonly RecordedMaintenance[],
): MaintenanceView[] {
  const fleet = model.maintenance.map((m, i) => ({
    id: `fleet-${i + 1}`,
    source: 'fleet' as const,
    date: m.date,
    action: m.action,
    note: m.note ?? null,
    by: m.by ?? null,
    recorded_at: null,
  }));
  const api = added.map((m) => ({
    id: `api-${m.id}`,
    source: 'api' as const,
    date: m.entry.date,
    action: m.entry.action,
    note: m.entry.note ?? null,
    by: m.entry.by ?? null,
    recorded_at: new Date(m.recorded_ms).toISOString(),
  }));
  return [...fleet, ...api].sort((a, b) => a.date.localeCompare(b.date));
}

/** One vehicle's row; `now_ms` (the API's clock) tells whether its inspection date is overdue. */
export function vehicleSummary(
  model: VehicleModel,
  data: VehicleData | undefined,
  last_seen_ms: number | undefined,
  open_alerts: number,
  now_ms: number,
): VehicleSummary {
  const r = data?.result;
  const now = data ? marginNow(data.assessment) : null;
  return {
    id: model.id,
    type: model.type,
    powertrain: model.powertrain,
    status: r?.status ?? null,
    cause: r?.cause ?? null,
    health: r?.health ?? { ram: null, fan: null },
    margin_pct: now?.margin_pct ?? null,
    limiting_ambient_c: now?.limiting_ambient_c ?? null,
    route_max_ambient_c: model.route_max_ambient_c,
    margin_basis: data?.assessment.series.margin.basis ?? null,
    projected_inspect_date: r?.projected_inspect_date ?? null,
    projected_inspect_overdue_days: overdueDays(r?.projected_inspect_date ?? null, now_ms),
    last_seen: last_seen_ms === undefined ? null : new Date(last_seen_ms).toISOString(),
    last_trip_end: data?.newest_first[0]?.end ?? null,
    trend: now?.trend ?? null,
    trend_pct_per_30d: now?.trend_pct_per_30d ?? null,
    trips: r?.trips.length ?? 0,
    open_alerts,
  };
}
