import { Caution } from '../components/Caution.tsx';
import { Loaded } from '../components/States.tsx';
import { ACTION_WORD, causeWord, num, RECOMMENDATION, STATUS_WORD, when } from '../format.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';
import { Figures } from './VehicleHistory.tsx';

const RECENT_MAINTENANCE = 5;

/** A printable work order for one vehicle (the browser prints it, or saves it as PDF). */
export function WorkOrder({ session, id }: { session: Session; id: string }) {
  const res = useResource(() => session.api.call('vehicle', { params: { id: id } }), [session, id]);
  return (
    <div class="screen work-order" data-screen="work-order">
      <nav class="crumbs no-print" aria-label="Breadcrumb">
        <a href={href.queue()}>Workshop queue</a> › work order {id}
      </nav>
      <Loaded res={res} what={`vehicle ${id}`}>
        {(v) => {
          const open = v.alerts.filter((a) => a.state !== 'closed');
          const cause = v.summary.cause ?? 'none';
          return (
            <article>
              <header class="screen-head">
                <h1>Cooling work order: {v.id}</h1>
                <button type="button" class="btn btn-primary no-print" onClick={() => print()}>
                  Print
                </button>
              </header>
              <p class="muted">
                {v.summary.type} · {v.config.powertrain} · radiator {num(v.config.radiator_area_m2, 'm²', 2)}{' '}
                · coolant limit {num(v.config.coolant_limit_c, '°C', 0)} · issued{' '}
                {when(new Date().toISOString())}
              </p>
              <Figures v={v} />
              <section>
                <h2>Finding</h2>
                <p>
                  <strong>{causeWord(cause, v.summary.status)}</strong>:{' '}
                  {v.cause_evidence ?? 'no evidence recorded'}
                </p>
                <h2>Recommended work</h2>
                <p data-fig="recommendation">{RECOMMENDATION[cause]}</p>
                <Caution text={v.safety_caution} />
              </section>
              <section>
                <h2>Open alerts ({open.length})</h2>
                <ul>
                  {open.map((a) => (
                    <li key={a.id}>
                      {when(a.time)} · {STATUS_WORD[a.status]} · {a.detail}
                    </li>
                  ))}
                </ul>
                <h2>Recent maintenance</h2>
                <ul>
                  {v.maintenance.slice(-RECENT_MAINTENANCE).map((m) => (
                    <li key={m.id}>
                      {when(m.date, false)} · {ACTION_WORD[m.action]}
                      {m.note ? ` · ${m.note}` : ''}
                    </li>
                  ))}
                  {!v.maintenance.length && <li>none logged</li>}
                </ul>
              </section>
              <section class="signoff">
                <h2>Workshop record</h2>
                <div class="line">Findings</div>
                <div class="line">Work done</div>
                <div class="line">Technician and date</div>
              </section>
            </article>
          );
        }}
      </Loaded>
    </div>
  );
}
