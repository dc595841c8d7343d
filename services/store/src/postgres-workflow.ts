import type { AuditEntry, MaintenanceEntry } from '@thermargin/shared';
import type { PostgresDb } from './postgres-db.ts';
import { type AlertAction, maintenanceDetail, type StoredToken, type WorkflowStore } from './workflow.ts';

/** The API's workflow records in PostgreSQL: each write and its audit row in one transaction. */
export function createPostgresWorkflowStore(db: PostgresDb): WorkflowStore {
  const audit = async (
    a: { by: string; role: string },
    action: string,
    target: string,
    detail: string,
    at_ms: number,
  ) => {
    await db.query(
      'INSERT INTO audit_log (at_ms, by_name, role, action, target, detail) VALUES ($1, $2, $3, $4, $5, $6)',
      [Math.round(at_ms), a.by, a.role, action, target, detail],
    );
  };
  const actions = (where: string, params: unknown[]) =>
    db.rows<AlertAction>(
      `SELECT vehicle, alert, action, by_name AS by, at_ms, note FROM alert_actions ${where} ORDER BY id`,
      params,
    );

  return {
    alertActions: (vehicle) => actions('WHERE vehicle = $1', [vehicle]),
    allAlertActions: () => actions('', []),
    recordAlertAction: (a, actor) =>
      db.transaction(async () => {
        await db.query(
          'INSERT INTO alert_actions (vehicle, alert, action, by_name, at_ms, note) VALUES ($1, $2, $3, $4, $5, $6)',
          [a.vehicle, a.alert, a.action, a.by, Math.round(a.at_ms), a.note],
        );
        await audit(actor, `alert.${a.action}`, `${a.vehicle}/${a.alert}`, a.note, a.at_ms);
      }),
    async maintenance(vehicle) {
      const rows = await db.rows<{ id: number; vehicle: string; doc: MaintenanceEntry; recorded_ms: number }>(
        'SELECT id, vehicle, doc, recorded_ms FROM maintenance_entries WHERE vehicle = $1 ORDER BY id',
        [vehicle],
      );
      return rows.map((r) => ({ id: r.id, vehicle: r.vehicle, entry: r.doc, recorded_ms: r.recorded_ms }));
    },
    addMaintenance: (vehicle, entry, actor, at_ms) =>
      db.transaction(async () => {
        const recorded_ms = Math.round(at_ms);
        const [row] = await db.rows<{ id: number }>(
          'INSERT INTO maintenance_entries (vehicle, doc, recorded_ms) VALUES ($1, $2, $3) RETURNING id',
          [vehicle, JSON.stringify(entry), recorded_ms],
        );
        await audit(actor, 'maintenance.add', vehicle, maintenanceDetail(entry), at_ms);
        return { id: row!.id, vehicle, entry, recorded_ms };
      }),
    tokens: () =>
      db.rows<StoredToken>('SELECT name, role, sha256, created_ms FROM api_tokens ORDER BY name COLLATE "C"'),
    addToken: (t, actor) =>
      db.transaction(async () => {
        await db.query('INSERT INTO api_tokens (name, role, sha256, created_ms) VALUES ($1, $2, $3, $4)', [
          t.name,
          t.role,
          t.sha256,
          Math.round(t.created_ms),
        ]);
        await audit(actor, 'token.add', t.name, `role ${t.role}`, t.created_ms);
      }),
    removeToken: (name, actor, at_ms) =>
      db.transaction(async () => {
        const removed =
          ((await db.query('DELETE FROM api_tokens WHERE name = $1', [name])).rowCount ?? 0) > 0;
        if (removed) await audit(actor, 'token.remove', name, '', at_ms);
        return removed;
      }),
    audit,
    async readAudit(limit) {
      const rows = await db.rows<Omit<AuditEntry, 'at'> & { at_ms: number }>(
        'SELECT id, at_ms, by_name AS by, role, action, target, detail FROM audit_log ORDER BY id DESC LIMIT $1',
        [limit],
      );
      return rows.map(({ at_ms, ...r }) => ({ ...r, at: new Date(at_ms).toISOString() }));
    },
    async revision() {
      const [row] = await db.rows<{ id: number }>('SELECT COALESCE(MAX(id), 0)::bigint AS id FROM audit_log');
      return row!.id;
    },
  };
}
