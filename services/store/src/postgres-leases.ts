import { hostname } from 'node:os';
import { randomBytes } from 'node:crypto';
import type { Lease, VehicleLeases } from './leases.ts';
import type { PostgresDb } from './postgres-db.ts';

export const LEASE_DEFAULTS = {
  /** ms, 30 000: a dead replica's vehicle is taken over at most this long after its last renewal. */
  ttl_ms: 30_000,
};

/** A replica's name: host, process and a random part (a restarted process is a new holder). */
export function replicaName(): string {
  return `${hostname()}-${process.pid}-${randomBytes(3).toString('hex')}`;
}

/**
 * Leases as rows of vehicle_leases, taken and renewed by single statements against the database's
 * clock (clock_timestamp()), so replicas' clocks never matter. A lease is taken when there is no row,
 * the row is this holder's, or it has expired; a new holder gets the next epoch.
 */
export function createPostgresLeases(
  db: PostgresDb,
  holder: string,
  ttl_ms = LEASE_DEFAULTS.ttl_ms,
): VehicleLeases {
  const ttl = `${Math.round(ttl_ms)} milliseconds`;
  return {
    holder,
    ttl_ms,
    async acquire(vehicle) {
      const [row] = await db.rows<{ epoch: number }>(
        `INSERT INTO vehicle_leases AS l (vehicle, holder, epoch, acquired_at, expires_at)
         VALUES ($1, $2, 1, clock_timestamp(), clock_timestamp() + $3::interval)
         ON CONFLICT (vehicle) DO UPDATE SET
           holder = excluded.holder,
           epoch = l.epoch + 1,
           acquired_at = excluded.acquired_at,
           expires_at = excluded.expires_at
         WHERE l.expires_at <= clock_timestamp() OR l.holder = excluded.holder
         RETURNING epoch`,
        [vehicle, holder, ttl],
      );
      return row ? { vehicle, holder, epoch: row.epoch } : null;
    },
    async renew(lease) {
      const r = await db.query(
        `UPDATE vehicle_leases SET expires_at = clock_timestamp() + $4::interval
         WHERE vehicle = $1 AND holder = $2 AND epoch = $3 AND expires_at > clock_timestamp()`,
        [lease.vehicle, lease.holder, lease.epoch, ttl],
      );
      return r.rowCount === 1;
    },
    async release(lease: Lease) {
      await db.query(
        `UPDATE vehicle_leases SET expires_at = clock_timestamp()
         WHERE vehicle = $1 AND holder = $2 AND epoch = $3`,
        [lease.vehicle, lease.holder, lease.epoch],
      );
    },
  };
}
