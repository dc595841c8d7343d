/**
 * Method parameters of the sizing evidence (duty cycle, derate statistics, fouling rates, "what if").
 * Unit and default first in each comment; defaults defined once here.
 */

/** One "what if": every sample's ambient raised and/or the coolant limit lowered. */
export interface WhatIfScenario {
  /** K, 0: added to every recorded ambient (a hotter design day). */
  ambient_rise_k: number;
  /** K, 0: subtracted from each vehicle's coolant limit (a tighter loop). */
  limit_drop_k: number;
}

export interface SizingOptions {
  /** km/h, [5, 20, 60, 90]: edges of the speed bands of the duty cycle (first band from 0, last open). */
  speed_edges_kmh: number[];
  /** °C, [10, 20, 30, 35, 40]: edges of the ambient bands of the duty cycle. */
  ambient_edges_c: number[];
  /** –, [0.5, 0.75, 1, 1.25]: heat levels, as shares of the vehicle's design heat, whose time above is reported. */
  heat_levels_share: number[];
  /** –, [0.5, 0.9, 0.95, 0.99]: percentiles of heat reported. */
  percentiles: number[];
  /**
   * s, 60: time constant of the traction-power mean that stands for the demand a derate cut short; a
   * loop time constant C/kA is of this order (150 kJ/K ÷ 2.5 kW/K = 60 s), so it is the load that drove
   * the loop to its limit.
   */
  demand_tau_s: number;
  /** trips, 6: valid trip k needed in one cleaning interval for a fouling fit (Sen's interval needs a few). */
  min_fouling_trips: number;
  /** days, 14: shortest cleaning interval fitted; shorter ones are dominated by trip noise. */
  min_fouling_span_days: number;
  /** days, 180: planned cleaning interval the fouling allowance is worked out for. */
  cleaning_interval_days: number;
  /** –, 0.15: fouling allowance the calculator uses where the fleet gives no fouling fit (common practice 10–25 %). */
  default_fouling_allowance: number;
  /**
   * –, 1: largest fouling allowance a fit may give (our bound): 100 % more area means the fit has k
   * halved within one cleaning interval, more than a core's fouling does (common practice plans
   * 10–25 %); a fit above it is reported with the reason instead, and the default is used.
   */
  max_fouling_allowance: number;
  /**
   * K, 5: in the replay the fan is taken at full duty once the coolant is within this of the limit
   * (controllers drive the fan to full before they derate; the recorded duty reflects the cooler real day).
   */
  fan_full_within_k: number;
  /**
   * K, 2: in the replay a derate, once begun, lasts until the coolant is this far below the limit
   * (controllers release with hysteresis; without it every heat fluctuation at the limit is an event).
   */
  derate_release_k: number;
  /** Scenarios of the "what if" replay; the recorded conditions (0, 0) are always replayed first. */
  what_if: WhatIfScenario[];
}

export const SIZING_DEFAULTS: Readonly<SizingOptions> = Object.freeze({
  speed_edges_kmh: [5, 20, 60, 90],
  ambient_edges_c: [10, 20, 30, 35, 40],
  heat_levels_share: [0.5, 0.75, 1, 1.25],
  percentiles: [0.5, 0.9, 0.95, 0.99],
  demand_tau_s: 60,
  min_fouling_trips: 6,
  min_fouling_span_days: 14,
  cleaning_interval_days: 180,
  default_fouling_allowance: 0.15,
  max_fouling_allowance: 1,
  fan_full_within_k: 5,
  derate_release_k: 2,
  what_if: [
    { ambient_rise_k: 5, limit_drop_k: 0 },
    { ambient_rise_k: 0, limit_drop_k: 5 },
  ],
});

function ascending(name: string, xs: readonly number[]): void {
  for (let i = 0; i < xs.length; i++) {
    if (!Number.isFinite(xs[i]!))
      throw new RangeError(`sizing option ${name}[${i}] must be finite, got ${xs[i]}`);
    if (i > 0 && !(xs[i]! > xs[i - 1]!)) throw new RangeError(`sizing option ${name} must be ascending`);
  }
}

/** Defaults overlaid with `o`, checked; the recorded-conditions scenario is put first. */
export function resolveSizingOptions(o: Partial<SizingOptions> = {}): SizingOptions {
  const out: SizingOptions = { ...SIZING_DEFAULTS, ...o };
  ascending('speed_edges_kmh', out.speed_edges_kmh);
  ascending('ambient_edges_c', out.ambient_edges_c);
  ascending('heat_levels_share', out.heat_levels_share);
  ascending('percentiles', out.percentiles);
  if (out.percentiles.some((p) => !(p > 0 && p < 1)))
    throw new RangeError('sizing option percentiles must lie within (0, 1)');
  for (const k of [
    'demand_tau_s',
    'min_fouling_trips',
    'min_fouling_span_days',
    'cleaning_interval_days',
  ] as const) {
    if (!(out[k] > 0 && Number.isFinite(out[k]))) throw new RangeError(`sizing option ${k} must be > 0`);
  }
  if (!(out.default_fouling_allowance >= 0))
    throw new RangeError('sizing option default_fouling_allowance must be ≥ 0');
  if (!(out.max_fouling_allowance >= out.default_fouling_allowance))
    throw new RangeError('sizing option max_fouling_allowance must be ≥ default_fouling_allowance');
  if (!(out.fan_full_within_k >= 0)) throw new RangeError('sizing option fan_full_within_k must be ≥ 0');
  if (!(out.derate_release_k >= 0)) throw new RangeError('sizing option derate_release_k must be ≥ 0');
  out.what_if.forEach((s, i) => {
    if (!Number.isFinite(s.ambient_rise_k) || !Number.isFinite(s.limit_drop_k))
      throw new RangeError(`sizing option what_if[${i}] must have finite ambient_rise_k and limit_drop_k`);
  });
  const recorded = { ambient_rise_k: 0, limit_drop_k: 0 };
  const rest = out.what_if.filter((s) => s.ambient_rise_k !== 0 || s.limit_drop_k !== 0);
  out.what_if = [recorded, ...rest];
  return out;
}
