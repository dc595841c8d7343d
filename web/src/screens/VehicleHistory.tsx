import type { VehicleResponse } from '@thermargin/shared/api';
import { HealthChart, MarginChart } from '../charts/vehicle-charts.tsx';
import { AlertList } from '../components/AlertList.tsx';
import { Caution } from '../components/Caution.tsx';
import { MaintenanceForm } from '../components/MaintenanceForm.tsx';
import { Empty, Loaded } from '../components/States.tsx';
import { DueMark, StatusMark, TrendMark } from '../components/StatusMark.tsx';
import { TripList } from '../components/TripList.tsx';
import { ACTION_WORD, BAND_WORD, CAUSE_WORD, causeWord, num, when } from '../format.ts';
import { useLive } from '../state/live.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import { canWrite, type Session } from '../state/session.ts';
import { Figure } from '../components/Figure.tsx';

/** Key figures of a vehicle: each number with its unit and what it means. */
export function Figures({ v }: { v: VehicleResponse }) {
  const s = v.summary;
  const route = v.config.route_max_ambient_c;
  const p = v.series?.projection;
  return (
    <dl class="figures">
      <Figure label="Status" fig="status">
        <StatusMark status={s.status} />
      </Figure>
      <Figure label="Cause" fig="cause">
        {causeWord(s.cause, s.status)}
      </Figure>
      <Figure label="Margin at design point" fig="margin">
        {num(s.margin_pct, '%')}
      </Figure>
      <Figure label="Limiting ambient" fig="lat">
        {num(s.limiting_ambient_c, '°C')}
        {route !== undefined && <span class="small muted"> route hottest {num(route, '°C')}</span>}
      </Figure>
      <Figure label="Trend" fig="trend">
        <TrendMark trend={s.trend} rate={s.trend_pct_per_30d} />
      </Figure>
      <Figure label="Projected inspection" fig="projected">
        <DueMark date={s.projected_inspect_date} overdue={s.projected_inspect_overdue_days} />
        {p?.interval && s.projected_inspect_overdue_days == null && (
          <span class="small muted">
            {' '}
            ({when(p.interval[0], false)} … {when(p.interval[1], false)})
          </span>
        )}
      </Figure>
      <Figure label={`Health: ${BAND_WORD.ram} / ${BAND_WORD.fan}`} fig="health">
        {num(s.health.ram === null ? null : s.health.ram * 100, '%')} /{' '}
        {num(s.health.fan === null ? null : s.health.fan * 100, '%')}
      </Figure>
      <Figure label="Last seen">{when(s.last_seen)}</Figure>
    </dl>
  );
}

function Body({ session, v, reload }: { session: Session; v: VehicleResponse; reload: () => void }) {
  const write = canWrite(session);
  return (
    <>
      <header class="screen-head">
        <h1>
          Vehicle history: {v.id} <span class="muted small">{v.summary.type}</span>
        </h1>
        {v.summary.status && v.summary.status !== 'ok' && (
          <a class="btn" href={href.workOrder(v.id)}>
            Work order
          </a>
        )}
      </header>
      <Figures v={v} />
      <section class="card" aria-labelledby="why">
        <h2 id="why">Why: the cause and its evidence</h2>
        <p data-fig="evidence">{v.cause_evidence ?? 'No finding yet: too few trips with a valid k.'}</p>
        {v.notes.length > 0 && (
          <ul>
            {v.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
        )}
        {v.candidates.length > 1 && (
          <details>
            <summary>Other causes weighed</summary>
            <ul>
              {v.candidates.map((c) => (
                <li key={c.cause}>
                  {CAUSE_WORD[c.cause]} (score {num(c.score * 100, '%', 0)}): {c.evidence}
                </li>
              ))}
            </ul>
          </details>
        )}
        {((v.summary.status && v.summary.status !== 'ok') || v.summary.open_alerts > 0) && (
          <Caution text={v.safety_caution} />
        )}
      </section>
      {v.series ? (
        <section class="charts" aria-label="Health and margin over time">
          <HealthChart s={v.series} maintenance={v.maintenance} />
          <MarginChart s={v.series} maintenance={v.maintenance} config={v.config} />
          {v.series.projection.reason && <p class="small muted">Projection: {v.series.projection.reason}</p>}
        </section>
      ) : (
        <Empty>No health series yet: the vehicle has no analysed trips.</Empty>
      )}
      <div class="two-col">
        <section class="card" aria-labelledby="alerts">
          <h2 id="alerts">Alerts</h2>
          <AlertList session={session} alerts={v.alerts} onChanged={reload} />
        </section>
        <section class="card" aria-labelledby="maint">
          <h2 id="maint">Maintenance log</h2>
          {v.maintenance.length ? (
            <ul class="maint">
              {v.maintenance.map((m) => (
                <li key={m.id} data-maintenance={m.id}>
                  <strong>{when(m.date, m.date.length > 10)}</strong> {ACTION_WORD[m.action]}
                  {m.by && <span class="muted"> · {m.by}</span>}
                  {m.note && <div class="small">{m.note}</div>}
                </li>
              ))}
            </ul>
          ) : (
            <Empty>No maintenance logged.</Empty>
          )}
          {write && <MaintenanceForm session={session} vehicle={v.id} onDone={reload} />}
        </section>
      </div>
      <section aria-labelledby="trips">
        <h2 id="trips">Trips ({v.trips_total})</h2>
        {v.trips_total ? (
          <TripList session={session} vehicle={v.id} first={v.trips} total={v.trips_total} />
        ) : (
          <Empty>No trips analysed yet.</Empty>
        )}
      </section>
    </>
  );
}

/** Vehicle history: one vehicle's health, margin, cause, alerts, maintenance and trips. */
export function VehicleHistory({ session, id }: { session: Session; id: string }) {
  const live = useLive();
  const res = useResource(
    () => session.api.call('vehicle', { params: { id: id } }),
    [session, id, live.version],
  );
  return (
    <div class="screen" data-screen="vehicle">
      <nav class="crumbs" aria-label="Breadcrumb">
        <a href={href.fleet()}>Margin overview</a> › {id}
      </nav>
      <Loaded res={res} what={`vehicle ${id}`}>
        {(v) => <Body session={session} v={v} reload={res.reload} />}
      </Loaded>
    </div>
  );
}
