import type { MaintenanceAction } from '@thermargin/shared/fleet';
import { useState } from 'preact/hooks';
import { ACTION_WORD } from '../format.ts';
import type { Session } from '../state/session.ts';

const ACTIONS = Object.keys(ACTION_WORD) as MaintenanceAction[];

/** Logs a workshop visit (engineer): the API re-baselines the bands and re-assesses the vehicle. */
export function MaintenanceForm({
  session,
  vehicle,
  onDone,
}: {
  session: Session;
  vehicle: string;
  onDone: () => void;
}) {
  const [date, setDate] = useState(() => new Date().toISOString().slice(0, 10));
  const [action, setAction] = useState<MaintenanceAction>('radiator_cleaned');
  const [note, setNote] = useState('');
  const [state, setState] = useState<{ busy: boolean; error: string | null; done: boolean }>({
    busy: false,
    error: null,
    done: false,
  });
  const submit = async (e: Event) => {
    e.preventDefault();
    setState({ busy: true, error: null, done: false });
    try {
      await session.api.call('logMaintenance', {
        params: { id: vehicle },
        body: { date, action, ...(note.trim() ? { note: note.trim() } : {}) },
      });
      setState({ busy: false, error: null, done: true });
      setNote('');
      onDone();
    } catch (err) {
      setState({ busy: false, error: (err as Error).message, done: false });
    }
  };
  const id = (k: string) => `mnt-${vehicle}-${k}`;
  return (
    <form
      class="inline-form maintenance-form"
      onSubmit={submit}
      aria-label={`Log maintenance for ${vehicle}`}
    >
      <label for={id('date')}>Date (UTC)</label>
      <input
        id={id('date')}
        type="date"
        required
        value={date}
        onInput={(e) => setDate((e.target as HTMLInputElement).value)}
      />
      <label for={id('action')}>Work done</label>
      <select
        id={id('action')}
        value={action}
        onChange={(e) => setAction((e.target as HTMLSelectElement).value as MaintenanceAction)}
      >
        {ACTIONS.map((a) => (
          <option key={a} value={a}>
            {ACTION_WORD[a]}
          </option>
        ))}
      </select>
      <label for={id('note')}>Note</label>
      <input
        id={id('note')}
        value={note}
        maxLength={2000}
        onInput={(e) => setNote((e.target as HTMLInputElement).value)}
      />
      <button type="submit" class="btn btn-primary" disabled={state.busy}>
        {state.busy ? 'Saving…' : 'Log maintenance'}
      </button>
      {state.done && (
        <p class="small" role="status">
          Logged; the vehicle was re-assessed.
        </p>
      )}
      {state.error && (
        <p class="state state-error" role="alert">
          {state.error}
        </p>
      )}
    </form>
  );
}
