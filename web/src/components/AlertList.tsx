import { ALERT_SELF_CLOSER, type AlertView } from '@thermargin/shared/api';
import { useState } from 'preact/hooks';
import { causeWord, when } from '../format.ts';
import { canWrite, type Session } from '../state/session.ts';
import { Empty } from './States.tsx';
import { StatusMark } from './StatusMark.tsx';

type Action = 'acknowledge' | 'close';
const STATE_WORD = { open: 'open', acknowledged: 'acknowledged', closed: 'closed' } as const;

function ActionForm({
  session,
  alert,
  action,
  onDone,
  onCancel,
}: {
  session: Session;
  alert: AlertView;
  action: Action;
  onDone: () => void;
  onCancel: () => void;
}) {
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    try {
      await session.api.call(action === 'close' ? 'closeAlert' : 'acknowledgeAlert', {
        params: { id: alert.vehicle, alert: alert.id },
        body: { note: note.trim() },
      });
      onDone();
    } catch (err) {
      setError((err as Error).message);
      setBusy(false);
    }
  };
  const id = `note-${alert.id}-${action}`;
  return (
    <form class="inline-form" onSubmit={submit}>
      <label for={id}>{action === 'close' ? 'Why is it closed?' : 'Note (who looks at it, when)'}</label>
      <input
        id={id}
        value={note}
        required
        maxLength={2000}
        onInput={(e) => setNote((e.target as HTMLInputElement).value)}
      />
      <button type="submit" class="btn btn-primary" disabled={busy || !note.trim()}>
        {action === 'close' ? 'Close alert' : 'Acknowledge'}
      </button>
      <button type="button" class="btn btn-quiet" onClick={onCancel}>
        Cancel
      </button>
      {error && (
        <p class="state state-error" role="alert">
          {error}
        </p>
      )}
    </form>
  );
}

/** Alerts with their state; engineers acknowledge or close them with a note (viewers see no buttons). */
export function AlertList({
  session,
  alerts,
  onChanged,
}: {
  session: Session;
  alerts: readonly AlertView[];
  onChanged: () => void;
}) {
  const [editing, setEditing] = useState<{ id: string; action: Action } | null>(null);
  if (!alerts.length) return <Empty>No alerts for this vehicle.</Empty>;
  const write = canWrite(session);
  return (
    <ul class="alerts">
      {alerts.map((a) => (
        <li key={a.id} class={`alert alert-${a.state}`} data-alert={a.id} data-state={a.state}>
          <div class="alert-head">
            <StatusMark status={a.status} />
            <span>{causeWord(a.cause, a.status)}</span>
            <span class="muted">{when(a.time)}</span>
            <span class={`pill pill-${a.state}`}>{STATE_WORD[a.state]}</span>
          </div>
          <p>{a.detail}</p>
          {a.acknowledged && (
            <p class="small muted">
              Acknowledged by {a.acknowledged.by}, {when(a.acknowledged.at)}: “{a.acknowledged.note}”
            </p>
          )}
          {a.closed && (
            <p class="small muted">
              {a.closed.by === ALERT_SELF_CLOSER ? 'Closed by itself' : `Closed by ${a.closed.by}`},{' '}
              {when(a.closed.at)}: “{a.closed.note}”
            </p>
          )}
          {write && a.state !== 'closed' && editing?.id !== a.id && (
            <div class="actions">
              {a.state === 'open' && (
                <button
                  type="button"
                  class="btn"
                  onClick={() => setEditing({ id: a.id, action: 'acknowledge' })}
                >
                  Acknowledge…
                </button>
              )}
              <button type="button" class="btn" onClick={() => setEditing({ id: a.id, action: 'close' })}>
                Close…
              </button>
            </div>
          )}
          {editing?.id === a.id && (
            <ActionForm
              session={session}
              alert={a}
              action={editing.action}
              onCancel={() => setEditing(null)}
              onDone={() => {
                setEditing(null);
                onChanged();
              }}
            />
          )}
        </li>
      ))}
    </ul>
  );
}
