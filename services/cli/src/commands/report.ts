import type { AnalysisReport, VehicleResult } from '@thermargin/shared';
import type { AnalyzedData } from './analyze-data.ts';

/** The analysis report in the contract's shape, vehicles in fleet-file order. */
export function buildReport(data: AnalyzedData): AnalysisReport & { dropped_values: Record<string, number> } {
  const dropped: Record<string, number> = {};
  const vehicles: VehicleResult[] = data.vehicles.map((v) => {
    const s = data.streams.get(v.id)!;
    for (const [k, n] of Object.entries(s.dropped)) dropped[k] = (dropped[k] ?? 0) + n;
    return { id: v.id, trips: s.trips };
  });
  return { vehicles, rejected: data.rejected, dropped_values: dropped };
}
