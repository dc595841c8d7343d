import type { FleetResponse } from '@thermargin/shared/api';
import type { Status } from '@thermargin/shared/results';
import { useEffect, useMemo, useState } from 'preact/hooks';
import { MarginHistogram } from '../charts/MarginHistogram.tsx';
import { Pager } from '../components/Pager.tsx';
import { RowLink } from '../components/RowLink.tsx';
import { SortHeader } from '../components/SortHeader.tsx';
import { Empty, Loaded } from '../components/States.tsx';
import { DueMark, StatusMark, TrendMark } from '../components/StatusMark.tsx';
import { ago, causeWord, num, STATUS_WORD, when } from '../format.ts';
import {
  DEFAULT_QUERY,
  type FleetQuery,
  type FleetRow,
  fleetView,
  headroom,
  type SortKey,
} from '../state/fleet-view.ts';
import { useLive } from '../state/live.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';

const PAGE = 50;
const FILTERS: (Status | 'unassessed' | 'all')[] = ['all', 'inspect', 'watch', 'ok', 'unassessed'];

function Counts({ counts }: { counts: FleetResponse['counts'] }) {
  const items: [Status | 'unassessed', number][] = [
    ['inspect', counts.inspect],
    ['watch', counts.watch],
    ['ok', counts.ok],
    ['unassessed', counts.unassessed],
  ];
  return (
    <ul class="counts" aria-label="Vehicles per status">
      {items.map(([s, n]) => (
        <li key={s} class={`count count-${s}`} data-count={s}>
          <StatusMark status={s === 'unassessed' ? null : s} />
          <strong>{n}</strong>
        </li>
      ))}
    </ul>
  );
}

function FleetTable({ fleet }: { fleet: FleetResponse }) {
  const live = useLive();
  const [q, setQ] = useState<FleetQuery>(DEFAULT_QUERY);
  const [page, setPage] = useState(0);
  const rows = useMemo(() => fleetView(fleet.vehicles as FleetRow[], q), [fleet, q]);
  const pages = Math.max(1, Math.ceil(rows.length / PAGE));
  const shown = rows.slice(Math.min(page, pages - 1) * PAGE, Math.min(page, pages - 1) * PAGE + PAGE);
  const now_ms = Date.parse(fleet.time);
  const update = (patch: Partial<FleetQuery>) => {
    setQ((old) => ({ ...old, ...patch }));
    setPage(0);
  };
  const onSort = (k: SortKey) => update({ sort: k, descending: q.sort === k ? !q.descending : false });
  const sortProps = { sort: q.sort, descending: q.descending, onSort };
  useEffect(() => {
    performance.mark('fleet:rendered');
  }, [fleet]);
  return (
    <section aria-labelledby="fleet-table-title">
      <div class="toolbar">
        <h2 id="fleet-table-title">Vehicles</h2>
        <label for="fleet-search">Search</label>
        <input
          id="fleet-search"
          type="search"
          value={q.search}
          placeholder="id, type, cause"
          onInput={(e) => update({ search: (e.target as HTMLInputElement).value })}
        />
        <label for="fleet-status">Status</label>
        <select
          id="fleet-status"
          value={q.status}
          onChange={(e) => update({ status: (e.target as HTMLSelectElement).value as FleetQuery['status'] })}
        >
          {FILTERS.map((f) => (
            <option key={f} value={f}>
              {f === 'all' ? 'all' : STATUS_WORD[f]}
            </option>
          ))}
        </select>
      </div>
      {rows.length === 0 ? (
        <Empty>No vehicle matches this search and filter.</Empty>
      ) : (
        <div class="table-wrap">
          <table class="grid fleet-table">
            <thead>
              <tr>
                <SortHeader k="id" {...sortProps}>
                  Vehicle
                </SortHeader>
                <SortHeader k="status" {...sortProps}>
                  Status
                </SortHeader>
                <SortHeader k="cause" {...sortProps}>
                  Cause
                </SortHeader>
                <SortHeader k="margin_pct" numeric {...sortProps}>
                  Margin at design point
                </SortHeader>
                <SortHeader k="limiting_ambient_c" numeric {...sortProps}>
                  Limiting ambient vs route hottest
                </SortHeader>
                <SortHeader k="trend" {...sortProps}>
                  Trend
                </SortHeader>
                <SortHeader k="projected_inspect_date" {...sortProps}>
                  Projected inspection
                </SortHeader>
                <SortHeader k="last_seen" {...sortProps}>
                  Last seen
                </SortHeader>
              </tr>
            </thead>
            <tbody>
              {shown.map((v) => {
                const room = headroom(v);
                const seen = live.lastSample.get(v.id) ?? v.last_seen;
                return (
                  <tr key={v.id} data-vehicle={v.id} class="row-link">
                    <td>
                      <RowLink to={href.vehicle(v.id)} label={`Open ${v.id}`}>
                        <strong>{v.id}</strong>
                      </RowLink>
                      <div class="muted small">{v.type}</div>
                    </td>
                    <td data-col="status">
                      <StatusMark status={v.status} />
                    </td>
                    <td data-col="cause">{causeWord(v.cause, v.status)}</td>
                    <td class="num" data-col="margin">
                      {num(v.margin_pct, '%')}
                    </td>
                    <td class="num" data-col="lat">
                      {num(v.limiting_ambient_c, '°C')}
                      {v.route_max_ambient_c != null && (
                        <div class={`small ${room !== null && room < 0 ? 'bad' : 'muted'}`}>
                          route {num(v.route_max_ambient_c, '°C')} · {room !== null && room >= 0 ? '+' : ''}
                          {num(room, 'K')}
                        </div>
                      )}
                    </td>
                    <td>
                      <TrendMark trend={v.trend} rate={v.trend_pct_per_30d} />
                    </td>
                    <td data-col="projected">
                      <DueMark date={v.projected_inspect_date} overdue={v.projected_inspect_overdue_days} />
                    </td>
                    <td data-col="seen" title={when(seen)}>
                      {ago(seen, now_ms)}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <Pager
        page={Math.min(page, pages - 1)}
        pages={pages}
        total={rows.length}
        what="vehicles"
        onPage={setPage}
      />
    </section>
  );
}

/** Margin overview: every vehicle's status at a glance, the margin distribution, and a sortable table. */
export function MarginOverview({ session }: { session: Session }) {
  const live = useLive();
  const res = useResource(() => session.api.call('fleet'), [session, live.version]);
  return (
    <div class="screen" data-screen="fleet">
      <h1>Margin overview</h1>
      <Loaded res={res} what="the fleet">
        {(fleet) =>
          fleet.vehicles.length === 0 ? (
            <Empty>The fleet file lists no vehicles yet.</Empty>
          ) : (
            <>
              <div class="overview">
                <Counts counts={fleet.counts} />
                <MarginHistogram vehicles={fleet.vehicles} />
              </div>
              <FleetTable fleet={fleet} />
            </>
          )
        }
      </Loaded>
    </div>
  );
}
