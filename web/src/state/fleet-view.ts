import type { VehicleSummary } from '@thermargin/shared/api';
import type { Status } from '@thermargin/shared/results';
import { causeWord } from '../format.ts';
import { byUrgency } from './queue.ts';

/** A fleet row. */
export type FleetRow = VehicleSummary;

export type SortKey =
  | 'id'
  | 'status'
  | 'cause'
  | 'margin_pct'
  | 'limiting_ambient_c'
  | 'trend'
  | 'projected_inspect_date'
  | 'last_seen';

export interface FleetQuery {
  search: string;
  status: Status | 'unassessed' | 'all';
  sort: SortKey;
  descending: boolean;
}

export const DEFAULT_QUERY: FleetQuery = { search: '', status: 'all', sort: 'status', descending: false };

const TREND_RANK = { falling: 0, steady: 1, rising: 2 } as const;

/** Sort value of a row (status sorts by urgency instead); null sorts last in either direction. */
function key(v: FleetRow, k: Exclude<SortKey, 'status'>): string | number | null {
  switch (k) {
    case 'cause':
      return v.cause ? causeWord(v.cause, v.status) : null;
    case 'trend':
      return v.trend ? TREND_RANK[v.trend] : null;
    case 'projected_inspect_date':
    case 'last_seen': {
      const t = v[k];
      return t ? Date.parse(t) : null;
    }
    default:
      return v[k];
  }
}

/** Rows matching the search (id, type, powertrain, cause words) and status filter, in the asked order. */
export function fleetView(rows: readonly FleetRow[], q: FleetQuery): FleetRow[] {
  const words = q.search.trim().toLowerCase().split(/\s+/).filter(Boolean);
  const out = rows.filter((v) => {
    if (q.status !== 'all' && (v.status ?? 'unassessed') !== q.status) return false;
    if (!words.length) return true;
    const hay =
      `${v.id} ${v.type} ${v.powertrain} ${v.cause ? causeWord(v.cause, v.status) : ''}`.toLowerCase();
    return words.every((w) => hay.includes(w));
  });
  const dir = q.descending ? -1 : 1;
  const sort = q.sort;
  if (sort === 'status') return out.sort((a, b) => byUrgency(a, b) * dir);
  return out.sort((a, b) => {
    const ka = key(a, sort);
    const kb = key(b, sort);
    if (ka === kb) return a.id.localeCompare(b.id);
    if (ka === null) return 1;
    if (kb === null) return -1;
    return (ka < kb ? -1 : 1) * dir;
  });
}

/** K: LAT minus the route's hottest expected ambient; negative means the route can overheat the vehicle. */
export const headroom = (v: FleetRow): number | null =>
  v.limiting_ambient_c !== null && v.route_max_ambient_c != null
    ? v.limiting_ambient_c - v.route_max_ambient_c
    : null;
