import { type AnalysisReport, withoutWindows } from '@thermargin/shared';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import type { AnalyzedData } from '../import/analyze-data.ts';

/**
 * The analysis report in the contract's shape, vehicles in fleet-file order, with their health; a vehicle
 * without a trip is unassessed with the reason, never `ok`.
 */
export function buildReport(data: AnalyzedData): AnalysisReport & {
  dropped_values: Record<string, number>;
  frames?: AnalyzedData['frames'];
} {
  const dropped: Record<string, number> = {};
  const vehicles = data.vehicles.map((v) => {
    const s = data.streams.get(v.id)!;
    for (const [k, n] of Object.entries(s.dropped)) dropped[k] = (dropped[k] ?? 0) + n;
    if (s.trips.length === 0) return { id: v.id, trips: [], unassessed: data.whyNoTrips(v.id) };
    const r = vehicleResult(v, s.trips).result;
    // The window evidence served the vehicle stage; the report gives the figures.
    return { ...r, trips: r.trips.map(withoutWindows) };
  });
  return {
    vehicles,
    rejected: data.rejected,
    dropped_values: dropped,
    ...(Object.keys(data.frames).length ? { frames: data.frames } : {}),
  };
}
