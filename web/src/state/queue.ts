import type { VehicleSummary } from '@thermargin/shared/api';
import { STATUS_RANK } from '../format.ts';

const FAR = Number.POSITIVE_INFINITY;
const due = (v: VehicleSummary) => (v.projected_inspect_date ? Date.parse(v.projected_inspect_date) : FAR);

/** Urgency order: inspect, watch, ok, unassessed; then the earliest projected inspection; then the lowest margin. */
export const byUrgency = (a: VehicleSummary, b: VehicleSummary): number =>
  STATUS_RANK[a.status ?? 'unassessed'] - STATUS_RANK[b.status ?? 'unassessed'] ||
  due(a) - due(b) ||
  (a.margin_pct ?? FAR) - (b.margin_pct ?? FAR) ||
  a.id.localeCompare(b.id);

/** The vehicles at watch or inspect, most urgent first. */
export const inspectionQueue = (vehicles: readonly VehicleSummary[]): VehicleSummary[] =>
  vehicles.filter((v) => v.status === 'watch' || v.status === 'inspect').sort(byUrgency);
