import type { AnalysisReport } from '@thermargin/shared';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import type { AnalyzedData } from '../import/analyze-data.ts';

/** The analysis report in the contract's shape, vehicles in fleet-file order, with their health. */
export function buildReport(data: AnalyzedData): AnalysisReport & { dropped_values: Record<string, number> } {
  const dropped: Record<string, number> = {};
  const vehicles = data.vehicles.map((v) => {
    const s = data.streams.get(v.id)!;
    for (const [k, n] of Object.entries(s.dropped)) dropped[k] = (dropped[k] ?? 0) + n;
    return vehicleResult(v, s.trips).result;
  });
  return { vehicles, rejected: data.rejected, dropped_values: dropped };
}
