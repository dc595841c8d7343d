import type { TripResult, VehicleResult } from '@thermargin/shared';
import type Database from 'better-sqlite3';
import type { ResultsStore } from './store.ts';

/** Results as JSON documents keyed by vehicle (+ trip): the analyzer rewrites them whole. */
export function createResultTables(db: Database.Database): Omit<ResultsStore, 'close'> {
  db.exec(`
    CREATE TABLE IF NOT EXISTS trip_results (
      vehicle TEXT NOT NULL, trip TEXT NOT NULL, start TEXT NOT NULL, json TEXT NOT NULL,
      PRIMARY KEY (vehicle, trip)) WITHOUT ROWID;
    CREATE TABLE IF NOT EXISTS vehicle_results (vehicle TEXT PRIMARY KEY, json TEXT NOT NULL) WITHOUT ROWID;`);
  const putTrip = db.prepare(
    'INSERT OR REPLACE INTO trip_results (vehicle, trip, start, json) VALUES (?, ?, ?, ?)',
  );
  const putTrips = db.transaction((vehicle: string, trips: readonly TripResult[]) => {
    for (const t of trips) putTrip.run(vehicle, t.trip, t.start, JSON.stringify(t));
  });
  const selectTrips = db
    .prepare('SELECT json FROM trip_results WHERE vehicle = ? ORDER BY start, trip')
    .pluck();
  const putVehicle = db.prepare('INSERT OR REPLACE INTO vehicle_results (vehicle, json) VALUES (?, ?)');
  const selectVehicle = db.prepare('SELECT json FROM vehicle_results WHERE vehicle = ?').pluck();
  const selectVehicles = db.prepare('SELECT json FROM vehicle_results ORDER BY vehicle').pluck();

  const trips = (vehicle: string) =>
    (selectTrips.all(vehicle) as string[]).map((j) => JSON.parse(j) as TripResult);
  const withTrips = (json: string): VehicleResult => {
    const v = JSON.parse(json) as VehicleResult;
    return { ...v, trips: trips(v.id) };
  };

  return {
    async putTripResults(vehicle, list) {
      putTrips(vehicle, list);
    },
    async readTripResults(vehicle) {
      return trips(vehicle);
    },
    async putVehicleResult(result) {
      putVehicle.run(result.id, JSON.stringify({ ...result, trips: [] }));
    },
    async readVehicleResult(vehicle) {
      const json = selectVehicle.get(vehicle) as string | undefined;
      return json === undefined ? undefined : withTrips(json);
    },
    async readVehicleResults() {
      return (selectVehicles.all() as string[]).map(withTrips);
    },
  };
}
