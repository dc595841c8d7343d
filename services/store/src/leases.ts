/**
 * Vehicles shared by several analyzer replicas: a replica works on a vehicle only while it holds the
 * vehicle's lease, and its commit is refused once the lease is no longer its own (fencing), so no two
 * replicas ever write one vehicle's results. A replica that dies leaves its lease to expire; another
 * takes the vehicle over then. Held in the results database (postgres-leases.ts); a single analyzer on
 * SQLite needs none.
 */
export interface VehicleLeases {
  /** This replica's name in the lease table and the analysis log. */
  readonly holder: string;
  /** ms: how long a lease lives unless renewed. */
  readonly ttl_ms: number;
  /** Takes the vehicle, or null while another replica's lease on it lives. */
  acquire(vehicle: string): Promise<Lease | null>;
  /** Extends the lease; false when it is no longer this replica's (expired, taken over). */
  renew(lease: Lease): Promise<boolean>;
  /** Lets another replica take the vehicle at once. */
  release(lease: Lease): Promise<void>;
}

export interface Lease {
  vehicle: string;
  holder: string;
  /** Grows with every change of holder: a commit carries the epoch it was begun under. */
  epoch: number;
}

/** A commit refused because its lease was lost (expired and possibly taken over) meanwhile. */
export class LeaseLostError extends Error {
  constructor(lease: Lease) {
    super(`lease on ${lease.vehicle} (epoch ${lease.epoch}) is no longer held by ${lease.holder}`);
    this.name = 'LeaseLostError';
  }
}

/** A commit refused because the stored watermark moved since the work began (another writer). */
export class WatermarkMovedError extends Error {
  constructor(vehicle: string, expected_ms: number | null, found_ms: number | null) {
    super(`watermark of ${vehicle} is ${found_ms}, not ${expected_ms} as when the analysis began`);
    this.name = 'WatermarkMovedError';
  }
}
