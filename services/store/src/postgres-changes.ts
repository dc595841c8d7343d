import type { Status, TripResult } from '@thermargin/shared';
import type { Logger } from '@thermargin/shared/log';
import pg from 'pg';
import type { ResultChange, ResultChanges } from './changes.ts';
import { RESULTS_CHANNEL } from './postgres-analysis.ts';
import type { PostgresDb } from './postgres-db.ts';

type Row = {
  id: number;
  vehicle: string;
  doc: TripResult | null;
  from_status: Status | null;
  to_status: Status | null;
  at: string | null;
};

/** ms: wait before connecting the listener again after it lost the server. */
const RECONNECT_MS = 1000;

/**
 * Change ids of trip_results and status_changes (postgres-analysis.ts numbers them in visibility
 * order) and the commit
 * notifications, received with LISTEN on one connection of its own, opened on the first subscriber and
 * reopened after a server restart.
 */
export function createPostgresChanges(db: PostgresDb, log: Logger = () => {}): ResultChanges {
  const listeners = new Set<() => void>();
  let client: pg.Client | undefined;
  let retry: NodeJS.Timeout | undefined;
  let closed = false;
  const tell = () => {
    for (const l of listeners) l();
  };

  async function listen(): Promise<void> {
    if (closed || client || listeners.size === 0) return;
    const c = new pg.Client({
      connectionString: db.options.url,
      connectionTimeoutMillis: db.options.connect_timeout_ms,
      application_name: 'thermargin-listen',
    });
    client = c;
    const lost = (e?: Error) => {
      if (client !== c) return;
      client = undefined;
      c.end().catch(() => {});
      if (!closed) {
        log('postgres_listen_lost', { error: e?.message ?? 'connection ended' });
        retry = setTimeout(() => listen().then(tell, () => {}), RECONNECT_MS);
      }
    };
    c.on('error', lost);
    c.on('end', () => lost());
    c.on('notification', tell);
    try {
      await c.connect();
      await c.query(`LISTEN ${RESULTS_CHANNEL}`);
    } catch (e) {
      lost(e as Error);
      throw e;
    }
  }

  return {
    async latest() {
      const [row] = await db.rows<{ id: number }>(
        `SELECT GREATEST((SELECT MAX(change_id) FROM trip_results),
           (SELECT MAX(change_id) FROM status_changes), 0)::bigint AS id`,
      );
      return row!.id;
    },
    async since(after, limit = 1000) {
      // Each change's trips in start order, then its status change, if any.
      const rows = await db.rows<Row>(
        `WITH ids AS (
           SELECT change_id FROM trip_results WHERE change_id > $1
           UNION SELECT change_id FROM status_changes WHERE change_id > $1
           ORDER BY change_id LIMIT $2)
         SELECT change_id AS id, vehicle, doc, NULL AS from_status, NULL AS to_status, NULL AS at,
           start_ms, trip COLLATE "C" AS trip
         FROM trip_results WHERE change_id IN (SELECT change_id FROM ids)
         UNION ALL
         SELECT change_id, vehicle, NULL, from_status, to_status, at, NULL, NULL
         FROM status_changes WHERE change_id IN (SELECT change_id FROM ids)
         ORDER BY id, start_ms NULLS LAST, trip`,
        [after, limit],
      );
      let index = 0;
      return rows.map((r, i): ResultChange => {
        index = i > 0 && rows[i - 1]!.id === r.id ? index + 1 : 0;
        const at = { id: r.id, index, vehicle: r.vehicle };
        return r.doc
          ? { ...at, kind: 'trip', trip: r.doc }
          : { ...at, kind: 'status', from: r.from_status, to: r.to_status!, time: r.at! };
      });
    },
    subscribe(listener) {
      listeners.add(listener);
      listen().catch(() => {});
      return () => {
        listeners.delete(listener);
        if (listeners.size === 0 && client) {
          const c = client;
          client = undefined;
          c.end().catch(() => {});
        }
      };
    },
    async close() {
      closed = true;
      clearTimeout(retry);
      const c = client;
      client = undefined;
      await c?.end().catch(() => {});
    },
  };
}
