import type { ApiEvent } from '@thermargin/shared/api';
import type { Status } from '@thermargin/shared/results';
import { createContext } from 'preact';
import { useContext, useEffect, useRef, useState } from 'preact/hooks';
import { type LiveState, subscribeEvents } from '../api/events.ts';

export interface StatusChange {
  vehicle: string;
  from: Status | null;
  to: Status;
  at_ms: number;
}

export interface Live {
  state: LiveState;
  /** Bumped (at most every REFRESH_MS) after trip or status events: screens reload when it moves. */
  version: number;
  /** The newest status changes, newest first. */
  changes: StatusChange[];
  /** Newest sample time per vehicle seen on the stream. */
  lastSample: ReadonlyMap<string, string>;
}

const REFRESH_MS = 800;
const KEEP_CHANGES = 5;

export const LiveContext = createContext<Live>({
  state: 'connecting',
  version: 0,
  changes: [],
  lastSample: new Map(),
});
export const useLive = (): Live => useContext(LiveContext);

/** The event stream of a signed-in session as React state; many events in a burst cause one reload. */
export function useLiveStream(token: string | null): Live {
  const [state, setState] = useState<LiveState>('connecting');
  const [version, setVersion] = useState(0);
  const [changes, setChanges] = useState<StatusChange[]>([]);
  const [lastSample, setLastSample] = useState<ReadonlyMap<string, string>>(new Map());
  const pending = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  useEffect(() => {
    if (!token) return;
    const bump = () => {
      pending.current ??= setTimeout(() => {
        pending.current = undefined;
        setVersion((v) => v + 1);
      }, REFRESH_MS);
    };
    const onEvent = (e: ApiEvent) => {
      if (e.event === 'sample') {
        const { vehicle, time } = e.data;
        setLastSample((m) => new Map(m).set(vehicle, time));
        return;
      }
      if (e.event === 'status') {
        const { vehicle, from, to } = e.data;
        setChanges((c) => [{ vehicle, from, to, at_ms: Date.now() }, ...c].slice(0, KEEP_CHANGES));
      }
      bump();
    };
    const stop = subscribeEvents(token, onEvent, setState);
    return () => {
      stop();
      clearTimeout(pending.current);
      pending.current = undefined;
    };
  }, [token]);
  return { state, version, changes, lastSample };
}
