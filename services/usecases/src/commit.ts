import type { MaintenanceEntry, Status, TripResult } from '@thermargin/shared';
import type { AnalysisCommit, AnalysisStore, StoredAnalysis } from '@thermargin/store/analysis';
import { vehicleResult, withMaintenance } from '@thermargin/core/vehicle-result';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';

/** How far a vehicle's analysis got: the watermark and the context the next run continues from. */
export type AnalysisProgress = Pick<
  StoredAnalysis,
  'analysed_to_ms' | 'previous_end_ms' | 'last_trip' | 'rejected'
>;

/** A vehicle not analysed yet. */
export const noProgress = (): AnalysisProgress => ({
  analysed_to_ms: 0,
  previous_end_ms: null,
  last_trip: null,
  rejected: {},
});

export interface AssessInput {
  /** Trip results new or recomputed since the last commit (replace stored ones by trip id). */
  trips: readonly TripResult[];
  /** Stored trips starting at or after this time are dropped first (re-analysis). */
  delete_from_ms?: number;
  /** The watermark and context to store; undefined keeps the stored one (a re-assessment). */
  state?: AnalysisProgress;
  /** An analyzer replica's lease and the watermark it began from (see AnalysisCommit). */
  fence?: AnalysisCommit['fence'];
}

export interface AssessOutcome {
  status_before: Status | null;
  status: Status;
  trips: TripResult[];
}

const startOf = (t: TripResult) => Date.parse(t.start);

/**
 * Merges new trip results with the stored ones, re-runs the health assessment over the vehicle's whole
 * history (fleet-file maintenance plus entries added beside it) and commits trips, summary and
 * watermark in one transaction, reading the stored state inside it (no lost update between processes).
 */
export function assessAndCommit(
  results: AnalysisStore,
  model: VehicleModel,
  extraMaintenance: readonly MaintenanceEntry[],
  input: AssessInput,
  now_ms: number,
): Promise<AssessOutcome> {
  return results.exclusive(model.id, async () => {
    const prev = await results.readAnalysis(model.id);
    const before = await results.readVehicleResult(model.id);
    const replaced = new Set(input.trips.map((t) => t.trip));
    const cut = input.delete_from_ms ?? Number.POSITIVE_INFINITY;
    const kept = (before?.trips ?? []).filter((t) => !replaced.has(t.trip) && startOf(t) < cut);
    const all = [...kept, ...input.trips].sort(
      (a, b) => startOf(a) - startOf(b) || a.trip.localeCompare(b.trip),
    );
    const { result, assessment } = vehicleResult(withMaintenance(model, extraMaintenance), all);
    const state = input.state ?? prev ?? noProgress();
    const { series, notes, candidates } = assessment;
    await results.commit({
      vehicle: model.id,
      trips: result.trips,
      ...(input.delete_from_ms === undefined ? {} : { delete_from_ms: input.delete_from_ms }),
      ...(input.fence ? { fence: input.fence } : {}),
      result,
      analysis: {
        analysed_to_ms: state.analysed_to_ms,
        previous_end_ms: state.previous_end_ms,
        last_trip: state.last_trip,
        rejected: state.rejected,
        assessment: { series, notes, candidates },
      },
      now_ms,
    });
    return { status_before: before?.status ?? null, status: result.status!, trips: result.trips };
  });
}
