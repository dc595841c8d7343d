import type pg from 'pg';

/**
 * The schema, one versioned step at a time: a released step is never edited, a change is a new step.
 * Each step runs in its own transaction with its row in schema_migrations; replicas starting together
 * take turns through an advisory lock, so each step runs once.
 */
export const MIGRATIONS: readonly { version: number; name: string; sql: string }[] = [
  {
    version: 1,
    name: 'results, analysis state and workflow records',
    sql: `
      CREATE TABLE trip_results (
        vehicle text NOT NULL, trip text NOT NULL, start_ms bigint NOT NULL, doc json NOT NULL,
        PRIMARY KEY (vehicle, trip));
      CREATE INDEX trip_results_by_start ON trip_results (vehicle, start_ms);
      CREATE TABLE vehicle_results (vehicle text PRIMARY KEY, doc json NOT NULL);
      CREATE TABLE vehicle_analysis (
        vehicle text PRIMARY KEY, analysed_to_ms bigint NOT NULL, version bigint NOT NULL,
        updated_ms bigint NOT NULL, doc json NOT NULL);
      CREATE TABLE alert_actions (
        id bigserial PRIMARY KEY, vehicle text NOT NULL, alert text NOT NULL, action text NOT NULL,
        by_name text NOT NULL, at_ms bigint NOT NULL, note text NOT NULL);
      CREATE INDEX alert_actions_by_vehicle ON alert_actions (vehicle, alert);
      CREATE TABLE maintenance_entries (
        id bigserial PRIMARY KEY, vehicle text NOT NULL, doc json NOT NULL, recorded_ms bigint NOT NULL);
      CREATE INDEX maintenance_by_vehicle ON maintenance_entries (vehicle);
      CREATE TABLE api_tokens (
        name text PRIMARY KEY, role text NOT NULL, sha256 text NOT NULL, created_ms bigint NOT NULL);
      CREATE TABLE audit_log (
        id bigserial PRIMARY KEY, at_ms bigint NOT NULL, by_name text NOT NULL, role text NOT NULL,
        action text NOT NULL, target text NOT NULL, detail text NOT NULL);`,
  },
  {
    version: 2,
    name: 'analyzer replicas: vehicle leases, analysis log, change ids for live events',
    sql: `
      CREATE TABLE vehicle_leases (
        vehicle text PRIMARY KEY, holder text NOT NULL, epoch bigint NOT NULL,
        acquired_at timestamptz NOT NULL, expires_at timestamptz NOT NULL);
      CREATE TABLE analysis_log (
        id bigserial PRIMARY KEY, vehicle text NOT NULL, holder text NOT NULL, epoch bigint NOT NULL,
        began_at timestamptz NOT NULL, committed_at timestamptz NOT NULL,
        from_ms bigint, to_ms bigint NOT NULL, trips_written integer NOT NULL, redo boolean NOT NULL);
      CREATE INDEX analysis_log_by_vehicle ON analysis_log (vehicle, id);
      CREATE SEQUENCE result_change;
      ALTER TABLE trip_results ADD COLUMN change_id bigint NOT NULL DEFAULT 0;
      CREATE INDEX trip_results_by_change ON trip_results (change_id);`,
  },
  {
    version: 3,
    name: 'status changes numbered with the commit that made them, for clients that resume',
    sql: `
      CREATE TABLE status_changes (
        change_id bigint PRIMARY KEY, vehicle text NOT NULL, from_status text, to_status text NOT NULL,
        at text NOT NULL);`,
  },
];

/** Advisory lock key of the migration step (any constant no other lock uses). */
const MIGRATION_LOCK = 0x7468_6d01;

/** Brings the database to the newest step; refuses a database migrated by a newer version. */
export async function migrate(pool: pg.Pool, steps = MIGRATIONS): Promise<number[]> {
  const client = await pool.connect();
  const applied: number[] = [];
  try {
    await client.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK]);
    await client.query(`CREATE TABLE IF NOT EXISTS schema_migrations (
      version integer PRIMARY KEY, name text NOT NULL, applied_at timestamptz NOT NULL DEFAULT now())`);
    const done = new Set(
      (await client.query<{ version: number }>('SELECT version FROM schema_migrations')).rows.map(
        (r) => r.version,
      ),
    );
    const newest = steps.at(-1)?.version ?? 0;
    const ahead = [...done].filter((v) => v > newest);
    if (ahead.length)
      throw new Error(
        `results database is at schema version ${Math.max(...ahead)}, newer than this program's ${newest}: upgrade the program`,
      );
    for (const step of steps) {
      if (done.has(step.version)) continue;
      await client.query('BEGIN');
      try {
        await client.query(step.sql);
        await client.query('INSERT INTO schema_migrations (version, name) VALUES ($1, $2)', [
          step.version,
          step.name,
        ]);
        await client.query('COMMIT');
      } catch (e) {
        await client.query('ROLLBACK');
        throw new Error(
          `results database migration ${step.version} (${step.name}) failed: ${(e as Error).message}`,
        );
      }
      applied.push(step.version);
    }
  } finally {
    await client.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK]).catch(() => {});
    client.release();
  }
  return applied;
}
