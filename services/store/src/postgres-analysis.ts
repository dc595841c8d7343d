import type { Status, TripResult, VehicleResult } from '@thermargin/shared';
import type { AnalysisCommit, AnalysisStore, StoredAnalysis } from './analysis.ts';
import { LeaseLostError, WatermarkMovedError } from './leases.ts';
import type { PostgresDb } from './postgres-db.ts';

/** Advisory lock class of a vehicle's results (the second key is the vehicle's hash). */
const VEHICLE_LOCK = 0x7468_6d02;
/** Advisory lock taken to number a commit's changes: held to its end, so change ids become visible
 *  in the order they are given (a reader that has seen id n never later finds a smaller one). */
const CHANGE_LOCK = 0x7468_6d03;
/** Channel of the notification every commit sends (payload: its change id). */
export const RESULTS_CHANNEL = 'thermargin_results';

type Row = { vehicle: string; analysed_to_ms: number; version: number; updated_ms: number; doc: object };
const fromRow = (r: Row): StoredAnalysis => ({
  ...(r.doc as Omit<StoredAnalysis, 'vehicle' | 'analysed_to_ms' | 'version' | 'updated_ms'>),
  vehicle: r.vehicle,
  analysed_to_ms: r.analysed_to_ms,
  version: r.version,
  updated_ms: r.updated_ms,
});

/** Vehicle ids and trip ids sort by code point, as SQLite's binary collation does, whatever the database's locale. */
const BY_ID = 'COLLATE "C"';

/**
 * Results and analysis state in PostgreSQL: the same documents as the SQLite adapter (JSON text kept
 * as written, so a result reads back exactly), one transaction per commit, and `exclusive` holding a
 * transaction-scoped advisory lock on the one vehicle, so writers of different vehicles (several
 * analyzers, an API re-assessing after a maintenance entry) run side by side.
 */
export function createPostgresAnalysisStore(db: PostgresDb): AnalysisStore {
  /** Writes the trips whose document is new or changed, tagged with `change_id`; how many it wrote. */
  async function putTrips(vehicle: string, trips: readonly TripResult[], change_id: number): Promise<number> {
    if (trips.length === 0) return 0;
    const r = await db.query(
      `INSERT INTO trip_results (vehicle, trip, start_ms, doc, change_id)
       SELECT $1, t.trip, t.start_ms, t.doc, $5
       FROM unnest($2::text[], $3::bigint[], $4::json[]) AS t(trip, start_ms, doc)
       ON CONFLICT (vehicle, trip) DO UPDATE SET start_ms = excluded.start_ms, doc = excluded.doc,
         change_id = excluded.change_id
       WHERE trip_results.doc::text IS DISTINCT FROM excluded.doc::text`,
      [
        vehicle,
        trips.map((t) => t.trip),
        trips.map((t) => Date.parse(t.start)),
        trips.map((t) => JSON.stringify(t)),
        change_id,
      ],
    );
    return r.rowCount ?? 0;
  }
  /** The next change id, under CHANGE_LOCK to the end of the transaction. */
  async function nextChange(): Promise<number> {
    await db.query('SELECT pg_advisory_xact_lock($1)', [CHANGE_LOCK]);
    const [row] = await db.rows<{ id: number }>("SELECT nextval('result_change') AS id");
    return row!.id;
  }
  /** The lease's start when the commit may go ahead (see AnalysisCommit.fence); throws when not. */
  async function checkFence(c: AnalysisCommit): Promise<Date | undefined> {
    if (!c.fence) return undefined;
    const { lease, from_ms } = c.fence;
    const [held] = await db.rows<{ acquired_at: Date }>(
      `SELECT acquired_at FROM vehicle_leases WHERE vehicle = $1 AND holder = $2 AND epoch = $3
         AND expires_at > clock_timestamp() FOR UPDATE`,
      [lease.vehicle, lease.holder, lease.epoch],
    );
    if (!held) throw new LeaseLostError(lease);
    const [stored] = await db.rows<{ analysed_to_ms: number }>(
      'SELECT analysed_to_ms FROM vehicle_analysis WHERE vehicle = $1 FOR UPDATE',
      [c.vehicle],
    );
    const found = stored?.analysed_to_ms ?? null;
    if (found !== from_ms) throw new WatermarkMovedError(c.vehicle, from_ms, found);
    return held.acquired_at;
  }
  /** Numbers a change of the vehicle's status with the commit's change (before its summary is replaced). */
  async function putStatus(result: VehicleResult, change_id: number): Promise<void> {
    const [was] = await db.rows<{ status: Status | null }>(
      "SELECT doc->>'status' AS status FROM vehicle_results WHERE vehicle = $1",
      [result.id],
    );
    const from = was ? (was.status ?? 'ok') : null;
    const to = result.status ?? 'ok';
    if (from === to) return;
    await db.query(
      'INSERT INTO status_changes (change_id, vehicle, from_status, to_status, at) VALUES ($1, $2, $3, $4, $5)',
      [change_id, result.id, from, to, result.trips.at(-1)?.end ?? ''],
    );
  }
  const putTripResults = (vehicle: string, trips: readonly TripResult[]) =>
    db.transaction(async () => {
      await putTrips(vehicle, trips, await nextChange());
    });
  const readTripResults = async (vehicle: string) =>
    (
      await db.rows<{ doc: TripResult }>(
        `SELECT doc FROM trip_results WHERE vehicle = $1 ORDER BY start_ms, trip ${BY_ID}`,
        [vehicle],
      )
    ).map((r) => r.doc);
  const putVehicleResult = async (result: VehicleResult) => {
    await db.query(
      `INSERT INTO vehicle_results (vehicle, doc) VALUES ($1, $2)
       ON CONFLICT (vehicle) DO UPDATE SET doc = excluded.doc`,
      [result.id, JSON.stringify({ ...result, trips: [] })],
    );
  };

  return {
    kind: 'postgres',
    putTripResults,
    readTripResults,
    putVehicleResult,
    async readVehicleResult(vehicle) {
      const [row] = await db.rows<{ doc: VehicleResult }>(
        'SELECT doc FROM vehicle_results WHERE vehicle = $1',
        [vehicle],
      );
      return row && { ...row.doc, trips: await readTripResults(vehicle) };
    },
    async readVehicleResults() {
      // One statement, so summaries and trips come from one snapshot.
      const rows = await db.rows<{ doc: VehicleResult; trips: TripResult[] }>(
        `SELECT v.doc, COALESCE((SELECT json_agg(t.doc ORDER BY t.start_ms, t.trip ${BY_ID})
           FROM trip_results t WHERE t.vehicle = v.vehicle), '[]') AS trips
         FROM vehicle_results v ORDER BY v.vehicle ${BY_ID}`,
      );
      return rows.map((r) => ({ ...r.doc, trips: r.trips }));
    },
    async readAnalysis(vehicle) {
      const [row] = await db.rows<Row>('SELECT * FROM vehicle_analysis WHERE vehicle = $1', [vehicle]);
      return row && fromRow(row);
    },
    async readAnalyses() {
      return (await db.rows<Row>(`SELECT * FROM vehicle_analysis ORDER BY vehicle ${BY_ID}`)).map(fromRow);
    },
    async versions() {
      const rows = await db.rows<{ vehicle: string; version: number }>(
        'SELECT vehicle, version FROM vehicle_analysis',
      );
      return new Map(rows.map((r) => [r.vehicle, r.version]));
    },
    async version(vehicle) {
      const [row] = await db.rows<{ version: number }>(
        'SELECT version FROM vehicle_analysis WHERE vehicle = $1',
        [vehicle],
      );
      return row?.version;
    },
    exclusive(vehicle, work) {
      return db.transaction(async () => {
        await db.query('SELECT pg_advisory_xact_lock($1, hashtext($2))', [VEHICLE_LOCK, vehicle]);
        return work();
      });
    },
    commit(c) {
      return db.transaction(async () => {
        const began = await checkFence(c);
        const change = await nextChange();
        if (c.delete_from_ms !== undefined)
          await db.query('DELETE FROM trip_results WHERE vehicle = $1 AND start_ms >= $2', [
            c.vehicle,
            Math.round(c.delete_from_ms),
          ]);
        const written = await putTrips(c.vehicle, c.trips, change);
        await putStatus(c.result, change);
        await putVehicleResult(c.result);
        const { analysed_to_ms, ...rest } = c.analysis;
        await db.query(
          `INSERT INTO vehicle_analysis (vehicle, analysed_to_ms, version, updated_ms, doc) VALUES ($1, $2, 1, $3, $4)
           ON CONFLICT (vehicle) DO UPDATE SET analysed_to_ms = excluded.analysed_to_ms,
             version = vehicle_analysis.version + 1, updated_ms = excluded.updated_ms, doc = excluded.doc`,
          [c.vehicle, Math.round(analysed_to_ms), Math.round(c.now_ms), JSON.stringify(rest)],
        );
        if (c.fence && began)
          await db.query(
            `INSERT INTO analysis_log
               (vehicle, holder, epoch, began_at, committed_at, from_ms, to_ms, trips_written, redo)
             VALUES ($1, $2, $3, $4, clock_timestamp(), $5, $6, $7, $8)`,
            [
              c.vehicle,
              c.fence.lease.holder,
              c.fence.lease.epoch,
              began,
              c.fence.from_ms,
              Math.round(analysed_to_ms),
              written,
              c.delete_from_ms !== undefined,
            ],
          );
        // Delivered at commit to every listening process (the APIs' live events).
        await db.query('SELECT pg_notify($1, $2)', [RESULTS_CHANNEL, String(change)]);
      });
    },
    close: () => db.close(),
  };
}
