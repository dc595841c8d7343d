import type { Policy } from '@thermargin/shared';

/**
 * The policy's margin and LAT thresholds as margins at the design point. From the rating formula,
 * 1 + margin = kA·(T_lim − T_amb,d)/Q and LAT = T_lim − Q/kA, so LAT = T_lim − (T_lim − T_amb,d)/(1 + margin):
 * "LAT below T" is "margin below 100·((T_lim − T_amb,d)/(T_lim − T) − 1)".
 * Example: limit 70 °C, design ambient 40 °C, LAT 45 °C → margin 20 %.
 */
export function marginForLat_pct(lat_c: number, coolant_limit_c: number, design_ambient_c: number): number {
  if (!(lat_c < coolant_limit_c)) {
    throw new RangeError(`LAT threshold ${lat_c} °C must be below the coolant limit ${coolant_limit_c} °C`);
  }
  return 100 * ((coolant_limit_c - design_ambient_c) / (coolant_limit_c - lat_c) - 1);
}

/** °C: LAT that goes with a design-point margin (inverse of marginForLat_pct). Example: 20 % → 45 °C. */
export function latForMargin_c(
  margin_pct: number,
  coolant_limit_c: number,
  design_ambient_c: number,
): number {
  return coolant_limit_c - (coolant_limit_c - design_ambient_c) / (1 + margin_pct / 100);
}

export interface MarginThresholds {
  /** %: enter inspect below this; leave only above `inspect_clear`. */
  inspect_enter: number;
  inspect_clear: number;
  watch_enter: number;
  watch_clear: number;
  /** Which rule sets each entry threshold, for the alert text. */
  inspect_rule: string;
  watch_rule: string;
}

export function marginThresholds(
  p: Policy,
  coolant_limit_c: number,
  design_ambient_c: number,
): MarginThresholds {
  const lat = (t: number) => marginForLat_pct(t, coolant_limit_c, design_ambient_c);
  const r = p.route_max_ambient_c;
  const h = p.hysteresis_margin_pct;
  const pick = (margin: number, latC: number | null, what: string) =>
    latC !== null && lat(latC) > margin
      ? { v: lat(latC), rule: `LAT below ${latC.toFixed(1)} °C (${what})` }
      : { v: margin, rule: `margin below ${margin} %` };
  const inspect = pick(p.inspect_margin_pct, r, "the route's hottest expected ambient");
  const watch = pick(
    p.watch_margin_pct,
    r === null ? null : r + p.watch_lat_headroom_k,
    `${p.watch_lat_headroom_k} K headroom`,
  );
  const clear = (margin: number, latC: number | null) =>
    Math.max(margin + h, latC === null ? Number.NEGATIVE_INFINITY : lat(latC + p.hysteresis_lat_k));
  return {
    inspect_enter: inspect.v,
    inspect_clear: clear(p.inspect_margin_pct, r),
    watch_enter: Math.max(watch.v, inspect.v),
    watch_clear: Math.max(
      clear(p.watch_margin_pct, r === null ? null : r + p.watch_lat_headroom_k),
      clear(p.inspect_margin_pct, r),
    ),
    inspect_rule: inspect.rule,
    watch_rule: watch.rule,
  };
}
