import type { MaintenanceAction, MaintenanceEntry } from '@thermargin/shared';
import type { Band } from '../trip/bands.ts';

/**
 * Which band a maintenance action starts afresh, and why:
 * - radiator_cleaned: both (fouling lowers both bands; a clean core is a new reference);
 * - fan_repaired: fan only (the ram band never depended on the fan);
 * - coolant_serviced: both (coolant flow sets the coolant-side share of k in every band);
 * - sensor_replaced: both (a biased sensor shifted the apparent k everywhere).
 */
export const REBASELINES: Readonly<Record<MaintenanceAction, readonly Band[]>> = Object.freeze({
  radiator_cleaned: ['ram', 'fan'],
  fan_repaired: ['fan'],
  coolant_serviced: ['ram', 'fan'],
  sensor_replaced: ['ram', 'fan'],
});

/** Epoch ms a maintenance entry takes effect: a bare date counts from 00:00 UTC (a shop day's trips come after). */
export function maintenanceTime_ms(m: MaintenanceEntry): number {
  const t = Date.parse(m.date.length === 10 ? `${m.date}T00:00:00Z` : m.date);
  if (!Number.isFinite(t)) throw new RangeError(`maintenance date "${m.date}" is not a valid date`);
  return t;
}

/** Sorted epoch-ms times at which `band` starts a new baseline period. */
export function rebaselineTimes_ms(log: readonly MaintenanceEntry[], band: Band): number[] {
  return log
    .filter((m) => REBASELINES[m.action].includes(band))
    .map(maintenanceTime_ms)
    .sort((a, b) => a - b);
}
