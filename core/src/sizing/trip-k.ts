import type { TripResult } from '@thermargin/shared';
import type { Band } from '../trip/bands.ts';

/**
 * A trip's k in one band for sizing, or null: trips with sensor flags give no k (a stuck or spiky
 * sensor biases it), as in the health assessment (health/assess.ts).
 */
export function tripK(t: TripResult, band: Band): number | null {
  if (t.sensor_flags.length > 0) return null;
  return band === 'ram' ? t.k_ram_w_m2k : t.k_fan_w_m2k;
}
