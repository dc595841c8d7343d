import { z } from 'zod';

/**
 * Inspection policy: when a vehicle goes to `watch` and `inspect`. Given at the top of the fleet file and
 * optionally per vehicle (per-vehicle keys override the fleet's, which override these defaults).
 */
export const POLICY_DEFAULTS = {
  /** %: margin at the design point below which the vehicle is inspected. */
  inspect_margin_pct: 0,
  /** %: margin below which it is watched. */
  watch_margin_pct: 10,
  /** K: watched when the limiting ambient is within this of the route's hottest expected ambient. */
  watch_lat_headroom_k: 5,
  /** °C: the route's hottest expected ambient; null means "not judged on LAT". */
  route_max_ambient_c: null as number | null,
  /** –: inspected when a band's health (k ÷ baseline k) falls below this, whatever the margin (our choice). */
  inspect_health_ratio: 0.7,
  /** %: watched when a change detector has signalled and the band's k sits this far below its reference. */
  watch_health_drop_pct: 8,
  /** % points: a margin must climb this far back above a threshold before the status steps down (and a
   *  fall of k that made a watch must come back within the watch drop less these points of k). */
  hysteresis_margin_pct: 2,
  /** K: the same deadband for the limiting ambient temperature. */
  hysteresis_lat_k: 1,
  /** trips: consecutive trips the better state must hold before the status steps down one level. */
  trips_to_step_down: 3,
} as const;

export const policySchema = z.strictObject({
  inspect_margin_pct: z.number().optional(),
  watch_margin_pct: z.number().optional(),
  watch_lat_headroom_k: z.number().min(0).optional(),
  route_max_ambient_c: z.number().min(-60).max(65).nullable().optional(),
  inspect_health_ratio: z.number().gt(0).lt(1).optional(),
  watch_health_drop_pct: z.number().min(0).max(100).optional(),
  hysteresis_margin_pct: z.number().min(0).optional(),
  hysteresis_lat_k: z.number().min(0).optional(),
  trips_to_step_down: z.number().int().min(1).optional(),
  /** The old name of `trips_to_step_down`, still read until the next release. */
  clear_trips: z.number().int().min(1).optional(),
});

/** Old policy keys still read, with the name each now has. */
export const OLD_POLICY_KEYS = { clear_trips: 'trips_to_step_down' } as const;

export type PolicyInput = z.infer<typeof policySchema>;
export type Policy = { -readonly [K in keyof typeof POLICY_DEFAULTS]: (typeof POLICY_DEFAULTS)[K] };

/** Effective policy: defaults, then the fleet's, then the vehicle's (undefined keys do not override). */
export function resolvePolicy(...layers: (PolicyInput | undefined)[]): Policy {
  const out: Policy = { ...POLICY_DEFAULTS };
  for (const layer of layers) {
    if (!layer) continue;
    for (const [k, v] of Object.entries(layer)) {
      const key = OLD_POLICY_KEYS[k as keyof typeof OLD_POLICY_KEYS] ?? k;
      // The new name wins over the old one in the same layer.
      if (v !== undefined && (key === k || layer[key as keyof PolicyInput] === undefined))
        (out as Record<string, unknown>)[key] = v;
    }
  }
  return out;
}
