import type { VehicleSummary } from '@thermargin/shared/api';
import { useState } from 'preact/hooks';
import { AlertList } from '../components/AlertList.tsx';
import { Caution } from '../components/Caution.tsx';
import { MaintenanceForm } from '../components/MaintenanceForm.tsx';
import { Pager } from '../components/Pager.tsx';
import { Empty, Loaded } from '../components/States.tsx';
import { DueMark, StatusMark } from '../components/StatusMark.tsx';
import { causeWord, num, RECOMMENDATION } from '../format.ts';
import { useLive } from '../state/live.ts';
import { inspectionQueue } from '../state/queue.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import { canWrite, type Session } from '../state/session.ts';

const PAGE = 10;

function QueueItem({
  session,
  v,
  rank,
  onChanged,
}: {
  session: Session;
  v: VehicleSummary;
  rank: number;
  onChanged: () => void;
}) {
  const live = useLive();
  const detail = useResource(
    () => session.api.call('vehicle', { params: { id: v.id } }),
    [session, v, live.version],
  );
  const [logging, setLogging] = useState(false);
  const changed = () => {
    detail.reload();
    onChanged();
  };
  return (
    <li class="card queue-item" data-queue={v.id}>
      <header class="queue-head">
        <span class="rank">
          <span class="sr-only">number </span>
          {rank}
        </span>
        <h2>
          <a href={href.vehicle(v.id)}>{v.id}</a> <span class="muted small">{v.type}</span>
        </h2>
        <StatusMark status={v.status} />
        <span>{causeWord(v.cause, v.status)}</span>
        <span class="num">margin {num(v.margin_pct, '%')}</span>
        <span class="num">limiting ambient {num(v.limiting_ambient_c, '°C')}</span>
        <span data-fig="due">
          {v.projected_inspect_overdue_days == null ? 'inspect by ' : 'inspection '}
          <DueMark date={v.projected_inspect_date} overdue={v.projected_inspect_overdue_days} />
        </span>
        <a class="btn" href={href.workOrder(v.id)}>
          Work order
        </a>
      </header>
      <p class="recommendation">
        <strong>Recommended:</strong> {RECOMMENDATION[v.cause ?? 'none']}
      </p>
      <Caution powertrains={[v.powertrain]} />
      <Loaded res={detail} what={`alerts of ${v.id}`}>
        {(d) => (
          <>
            {d.cause_evidence && <p class="small">Evidence: {d.cause_evidence}</p>}
            <AlertList
              session={session}
              alerts={d.alerts.filter((a) => a.state !== 'closed')}
              onChanged={changed}
            />
          </>
        )}
      </Loaded>
      {canWrite(session) &&
        (logging ? (
          <MaintenanceForm session={session} vehicle={v.id} onDone={changed} />
        ) : (
          <button type="button" class="btn" onClick={() => setLogging(true)}>
            Log maintenance…
          </button>
        ))}
    </li>
  );
}

/** Workshop queue: vehicles at watch or inspect by urgency, with their recommendation and actions. */
export function WorkshopQueue({ session }: { session: Session }) {
  const live = useLive();
  const res = useResource(() => session.api.call('fleet'), [session, live.version]);
  const [page, setPage] = useState(0);
  return (
    <div class="screen" data-screen="queue">
      <h1>Workshop queue</h1>
      <Loaded res={res} what="the queue">
        {(fleet) => {
          const queue = inspectionQueue(fleet.vehicles);
          if (!queue.length) return <Empty>No vehicle is at watch or inspect.</Empty>;
          const pages = Math.ceil(queue.length / PAGE);
          const p = Math.min(page, pages - 1);
          return (
            <>
              <ol class="queue">
                {queue.slice(p * PAGE, p * PAGE + PAGE).map((v, i) => (
                  <QueueItem
                    key={v.id}
                    session={session}
                    v={v}
                    rank={p * PAGE + i + 1}
                    onChanged={res.reload}
                  />
                ))}
              </ol>
              <Pager
                page={p}
                pages={pages}
                total={queue.length}
                what="vehicles in the queue"
                onPage={setPage}
              />
            </>
          );
        }}
      </Loaded>
    </div>
  );
}
