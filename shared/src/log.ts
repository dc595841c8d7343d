import type { StoreFaultKind } from './store-faults.ts';

/**
 * Every event the services log, with its detail: one map, so a call with a misspelt event or a missing
 * field fails to compile, and an operator finds every line a deployment can write in one place. Each is
 * written as one JSON line, `{"event": …, …detail}` (stderr by default).
 */
export interface LogEvents {
  // ingester
  ingester_started: { filter: string; connections: number; store: string };
  ingester_stopped: { acked: number; spool_segments: number };
  mqtt_error: { client: string | undefined; error: string };
  subscribe_refused: { client: string | undefined; filter: string; error: string };
  decode_worker_error: { error: string };
  decode_worker_exit: { code: number; replaced: boolean };
  pipeline_error: { error: string };
  /** Said once per change of fault (disk full → read-only …), with the system's words. */
  store_down: { kind: StoreFaultKind; reason: string };
  store_up: { spool_segments: number };
  /** The spool's own disk refuses writes too: nothing more is acknowledged until it takes them again. */
  spool_unwritable: { kind: StoreFaultKind; reason: string };
  spool_writable: Record<string, never>;
  metrics: { port: number | undefined };
  shutdown: { signal: string };
  // results database
  postgres_idle_connection_lost: { error: string };
  postgres_listen_lost: { error: string };
  // analyzer
  analyzer_started: { results: string; replica: string };
  analyzer_error: { error: string };
  analyzer_lease_lost: { vehicle: string; error: string };
  fleet_reloaded: { vehicles: number };
  fleet_reload_failed: { error: string };
  health: { port: number };
  // API
  api_error: { path: string; error: string };
  api_store_unavailable: { path: string; kind?: StoreFaultKind; error: string };
  auth_backoff: { address: string; failures: number; wait_s: number };
  events_poll_failed: { error: string };
  reanalyze_failed: { vehicle: string; error: string };
}

export type LogEvent = keyof LogEvents;

/** Where a service sends its events. */
export type Logger = <E extends LogEvent>(event: E, detail: LogEvents[E]) => void;
