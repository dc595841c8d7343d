/**
 * `npm run bench:health`: time of `assessVehicle` on one vehicle's history of 100, 365 and 730 trips
 * (the analyzer re-runs it over the whole history at every commit), beside a baseline measured in the
 * same run: sorting the same trips by start time. Prints figures; asserts nothing.
 */
import type { TripResult } from '@thermargin/shared';
import { assessVehicle } from '@thermargin/core/health/assess';
import { generateScenario } from '../support/health-fleet/generate.ts';
import { scenarioParams } from '../support/health-fleet/scenarios.ts';

const SIZES = [100, 365, 730] as const;
const REPEATS = Number(process.env.BENCH_REPEATS ?? 5);

/** Median wall time of `f` in ms over REPEATS runs, after one warm-up run. */
function time(f: () => unknown): number {
  f();
  const ms: number[] = [];
  for (let r = 0; r < REPEATS; r++) {
    const t0 = performance.now();
    f();
    ms.push(performance.now() - t0);
  }
  return ms.sort((a, b) => a - b)[Math.floor(REPEATS / 2)]!;
}

// A fouling vehicle over two years: the detectors signal and the projection runs its fits.
const s = generateScenario({ ...scenarioParams('B', 'fouling', 1), days: 730, trips_per_day: 1.1 });
const sortTrips = (trips: readonly TripResult[]) =>
  [...trips].sort((a, b) => Date.parse(a.start) - Date.parse(b.start));

console.log(`assessVehicle, one vehicle, median of ${REPEATS} runs`);
console.log('trips   assessVehicle ms   baseline sort ms   ratio');
for (const n of SIZES) {
  const trips = s.trips.slice(0, n);
  if (trips.length < n) throw new Error(`generator gave ${trips.length} trips, wanted ${n}`);
  const a = time(() => assessVehicle(s.vehicle, trips));
  const b = time(() => sortTrips(trips));
  console.log(
    `${String(n).padStart(5)}   ${a.toFixed(2).padStart(16)}   ${b.toFixed(3).padStart(16)}   ${(a / b).toFixed(0).padStart(5)}`,
  );
}
