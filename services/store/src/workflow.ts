import type { ApiRole, AuditEntry, MaintenanceEntry } from '@thermargin/shared';

/** What an alert action records. */
export interface AlertAction {
  vehicle: string;
  alert: string;
  action: 'acknowledge' | 'close';
  by: string;
  at_ms: number;
  note: string;
}

/** A maintenance entry added through the API (beside the fleet file's own). */
export interface RecordedMaintenance {
  id: number;
  vehicle: string;
  entry: MaintenanceEntry;
  recorded_ms: number;
}

/** A token added through the API: only its hash is kept. */
export interface StoredToken {
  name: string;
  role: ApiRole;
  sha256: string;
  created_ms: number;
}

export interface Actor {
  by: string;
  role: ApiRole;
}

/**
 * What the API persists beyond the analyzer's results: alert acknowledgements and closures, maintenance
 * entries, tokens, and an audit log of every write. Each write and its audit row share one transaction.
 * Every value is a bound parameter. Implemented on SQLite (sqlite-workflow.ts) and PostgreSQL
 * (postgres-workflow.ts).
 */
export interface WorkflowStore {
  alertActions(vehicle: string): Promise<AlertAction[]>;
  /** Every vehicle's alert actions (fleet summary: open alert counts). */
  allAlertActions(): Promise<AlertAction[]>;
  recordAlertAction(a: AlertAction, actor: Actor): Promise<void>;
  maintenance(vehicle: string): Promise<RecordedMaintenance[]>;
  addMaintenance(
    vehicle: string,
    entry: MaintenanceEntry,
    actor: Actor,
    at_ms: number,
  ): Promise<RecordedMaintenance>;
  tokens(): Promise<StoredToken[]>;
  addToken(t: StoredToken, actor: Actor): Promise<void>;
  /** True when a token of that name was removed. */
  removeToken(name: string, actor: Actor, at_ms: number): Promise<boolean>;
  /** Records a write that has no table of its own (e.g. a fleet-file reload). */
  audit(actor: Actor, action: string, target: string, detail: string, at_ms: number): Promise<void>;
  /** Newest first, at most `limit`. */
  readAudit(limit: number): Promise<AuditEntry[]>;
  /** Grows with every write (the newest audit row's id): readers cache by it. */
  revision(): Promise<number>;
}

/** The maintenance entry's audit detail, in one place for every adapter. */
export function maintenanceDetail(entry: MaintenanceEntry): string {
  return `${entry.date} ${entry.action}${entry.note ? `: ${entry.note}` : ''}`;
}
