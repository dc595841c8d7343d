import type { AuditEntry, MaintenanceEntry } from '@thermargin/shared';
import type Database from 'better-sqlite3';
import {
  type Actor,
  type AlertAction,
  maintenanceDetail,
  type RecordedMaintenance,
  type StoredToken,
  type WorkflowStore,
} from './workflow.ts';

/** The workflow records in the results database (one transaction per write with its audit row). */
export type { Actor, AlertAction, RecordedMaintenance, StoredToken, WorkflowStore } from './workflow.ts';

export function createWorkflowStore(db: Database.Database): WorkflowStore {
  db.exec(`
    CREATE TABLE IF NOT EXISTS alert_actions (
      id INTEGER PRIMARY KEY, vehicle TEXT NOT NULL, alert TEXT NOT NULL, action TEXT NOT NULL,
      by TEXT NOT NULL, at_ms INTEGER NOT NULL, note TEXT NOT NULL);
    CREATE INDEX IF NOT EXISTS alert_actions_by_vehicle ON alert_actions (vehicle, alert);
    CREATE TABLE IF NOT EXISTS maintenance_entries (
      id INTEGER PRIMARY KEY, vehicle TEXT NOT NULL, json TEXT NOT NULL, recorded_ms INTEGER NOT NULL);
    CREATE INDEX IF NOT EXISTS maintenance_by_vehicle ON maintenance_entries (vehicle);
    CREATE TABLE IF NOT EXISTS api_tokens (
      name TEXT PRIMARY KEY, role TEXT NOT NULL, sha256 TEXT NOT NULL, created_ms INTEGER NOT NULL) WITHOUT ROWID;
    CREATE TABLE IF NOT EXISTS audit_log (
      id INTEGER PRIMARY KEY, at_ms INTEGER NOT NULL, by TEXT NOT NULL, role TEXT NOT NULL,
      action TEXT NOT NULL, target TEXT NOT NULL, detail TEXT NOT NULL);`);
  const q = {
    actions: db.prepare(
      'SELECT vehicle, alert, action, by, at_ms, note FROM alert_actions WHERE vehicle = ? ORDER BY id',
    ),
    allActions: db.prepare('SELECT vehicle, alert, action, by, at_ms, note FROM alert_actions ORDER BY id'),
    addAction: db.prepare(
      'INSERT INTO alert_actions (vehicle, alert, action, by, at_ms, note) VALUES (@vehicle, @alert, @action, @by, @at_ms, @note)',
    ),
    maintenance: db.prepare(
      'SELECT id, vehicle, json, recorded_ms FROM maintenance_entries WHERE vehicle = ? ORDER BY id',
    ),
    addMaintenance: db.prepare(
      'INSERT INTO maintenance_entries (vehicle, json, recorded_ms) VALUES (?, ?, ?)',
    ),
    tokens: db.prepare('SELECT name, role, sha256, created_ms FROM api_tokens ORDER BY name'),
    addToken: db.prepare(
      'INSERT INTO api_tokens (name, role, sha256, created_ms) VALUES (@name, @role, @sha256, @created_ms)',
    ),
    removeToken: db.prepare('DELETE FROM api_tokens WHERE name = ?'),
    audit: db.prepare(
      'INSERT INTO audit_log (at_ms, by, role, action, target, detail) VALUES (?, ?, ?, ?, ?, ?)',
    ),
    readAudit: db.prepare('SELECT * FROM audit_log ORDER BY id DESC LIMIT ?'),
    revision: db.prepare('SELECT COALESCE(MAX(id), 0) FROM audit_log').pluck(),
  };
  const audit = (a: Actor, action: string, target: string, detail: string, at_ms: number) =>
    q.audit.run(Math.round(at_ms), a.by, a.role, action, target, detail);
  type MRow = { id: number; vehicle: string; json: string; recorded_ms: number };
  const mFromRow = (r: MRow): RecordedMaintenance => ({
    id: r.id,
    vehicle: r.vehicle,
    entry: JSON.parse(r.json) as MaintenanceEntry,
    recorded_ms: r.recorded_ms,
  });

  const recordAlertAction = db.transaction((a: AlertAction, actor: Actor) => {
    q.addAction.run({ ...a, at_ms: Math.round(a.at_ms) });
    audit(actor, `alert.${a.action}`, `${a.vehicle}/${a.alert}`, a.note, a.at_ms);
  });
  const addMaintenance = db.transaction(
    (vehicle: string, entry: MaintenanceEntry, actor: Actor, at_ms: number): RecordedMaintenance => {
      const r = q.addMaintenance.run(vehicle, JSON.stringify(entry), Math.round(at_ms));
      audit(actor, 'maintenance.add', vehicle, maintenanceDetail(entry), at_ms);
      return { id: Number(r.lastInsertRowid), vehicle, entry, recorded_ms: Math.round(at_ms) };
    },
  );
  const addToken = db.transaction((t: StoredToken, actor: Actor) => {
    q.addToken.run({ ...t, created_ms: Math.round(t.created_ms) });
    audit(actor, 'token.add', t.name, `role ${t.role}`, t.created_ms);
  });
  const removeToken = db.transaction((name: string, actor: Actor, at_ms: number) => {
    const removed = q.removeToken.run(name).changes > 0;
    if (removed) audit(actor, 'token.remove', name, '', at_ms);
    return removed;
  });

  return {
    alertActions: async (vehicle) => q.actions.all(vehicle) as AlertAction[],
    allAlertActions: async () => q.allActions.all() as AlertAction[],
    recordAlertAction: async (a, actor) => recordAlertAction(a, actor),
    maintenance: async (vehicle) => (q.maintenance.all(vehicle) as MRow[]).map(mFromRow),
    addMaintenance: async (vehicle, entry, actor, at_ms) => addMaintenance(vehicle, entry, actor, at_ms),
    tokens: async () => q.tokens.all() as StoredToken[],
    addToken: async (t, actor) => addToken(t, actor),
    removeToken: async (name, actor, at_ms) => removeToken(name, actor, at_ms),
    audit: async (actor, action, target, detail, at_ms) => {
      audit(actor, action, target, detail, at_ms);
    },
    revision: async () => q.revision.get() as number,
    readAudit: async (limit) =>
      (q.readAudit.all(limit) as (Omit<AuditEntry, 'at'> & { at_ms: number })[]).map(({ at_ms, ...r }) => ({
        ...r,
        at: new Date(at_ms).toISOString(),
      })),
  };
}
