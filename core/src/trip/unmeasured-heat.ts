import type { BandWindowsEvidence } from '@thermargin/shared';
import { medianCi95Sorted } from '../stats/median-ci.ts';
import { median, quantileSorted } from '../stats/quantile.ts';
import { type Airside, bandFactor } from '../radiator/airside.ts';
import { huberFit } from '../stats/huber.ts';
import { BAND_NAMES } from './bands.ts';
import { roundTo } from '../stats/round.ts';

/** Rules of the unmeasured-heat estimate; defaults defined once here. */
export const UNMEASURED_HEAT_DEFAULTS = {
  /** trips, 6: the fewest whose median has a 95 % order-statistic interval. */
  min_trips: 6,
  /** windows, 2: a trip counts with at least this many windows carrying both heats. */
  min_windows_per_trip: 2,
} as const;

export interface UnmeasuredHeat {
  /** kW: the value used (fitted, the fleet file's, or 0). */
  value_kw: number;
  /** 95 % interval of the estimate, when the data gave one. */
  ci95: [number, number] | null;
  basis: 'fitted' | 'fleet_file' | 'none';
  /** Trips the estimate rests on. */
  trips: number;
  /** Why it is not fitted, in words; null when fitted or given. */
  reason: string | null;
}

/** One trip's windows as the estimate reads them. */
export interface HeatTrip {
  windows: { ram: BandWindowsEvidence; fan: BandWindowsEvidence };
  /** K added to the measured ambient on this trip. */
  ambient_correction_k: number;
}

/**
 * kW of steady heat into the loop that the traction power does not carry (pumps, power electronics, a
 * compressor on the same loop): the intercept of heat rejected against traction heat (less storage)
 * within one band.
 * - With a coolant flow meter the heat rejected is measured (ρ·cp·V̇·ΔT) and the line has unit slope:
 *   per trip the median of (meter − balance) over the band's near-steady windows, over trips their
 *   median with the distribution-free 95 % interval of a median (trips are independent, the windows of
 *   one trip are not).
 * - Without one, heat rejected is k·A·g·ITD with k the trip's own (a level per trip and band) and g the
 *   air-side factor: balance = k·x − Q_aux, x = A·g·ITD, fitted as balance/x = k − Q_aux/x by the Huber
 *   fit of stats/huber.ts with intervals clustered by trip. Only with an electrically driven pump: an
 *   engine-driven pump's flow follows the engine's load, so k rises with the heat and the intercept
 *   would read that rise (on the forward model, 2–5 times the true value).
 * Fitted only when the interval excludes zero (and is above it); otherwise 0, and the reason says why.
 * Example: per-trip medians 1.9, 2.1, 2.0, 2.2, 1.8, 2.0 kW (flow meter) → 2.0 kW, fitted.
 */
export function unmeasuredHeat(
  known_kw: number | null,
  trips: readonly HeatTrip[],
  shape: { airside: Airside; area_m2: number; engine_pump: boolean },
  o: typeof UNMEASURED_HEAT_DEFAULTS = UNMEASURED_HEAT_DEFAULTS,
): UnmeasuredHeat {
  if (known_kw !== null)
    return { value_kw: known_kw, ci95: null, basis: 'fleet_file', trips: 0, reason: null };
  const none = (reason: string, n: number, ci95: [number, number] | null = null): UnmeasuredHeat => ({
    value_kw: 0,
    ci95,
    basis: 'none',
    trips: n,
    reason,
  });
  const judged = (value: number, ci: [number, number], n: number): UnmeasuredHeat => {
    const ci95 = [roundTo(ci[0], 3), roundTo(ci[1], 3)] as [number, number];
    return ci[0] > 0
      ? { value_kw: roundTo(value, 3), ci95, basis: 'fitted', trips: n, reason: null }
      : none(`${roundTo(value, 3)} kW, but its 95 % interval includes zero or less`, n, ci95);
  };
  const medians = meterMedians(trips, o);
  if (medians.length > 0) {
    if (medians.length < o.min_trips)
      return none(`flow-meter windows on ${medians.length} trips, need ${o.min_trips}`, medians.length);
    const sorted = Float64Array.from(medians).sort();
    return judged(quantileSorted(sorted, 0.5), medianCi95Sorted(sorted)!, medians.length);
  }
  if (shape.engine_pump)
    return none(
      'no flow meter, and the engine drives the coolant pump: heat rejected is not measured and k rises with the load, so the intercept cannot be read (give aux_heat_kw in the fleet file)',
      0,
    );
  return balanceIntercept(trips, shape, o, judged, none);
}

/** Per trip, in the band with more such trips, the median of (meter − balance) over its windows. */
function meterMedians(trips: readonly HeatTrip[], o: typeof UNMEASURED_HEAT_DEFAULTS): number[] {
  const perBand = BAND_NAMES.map((band) =>
    trips.flatMap((t) => {
      const e = t.windows[band];
      const d: number[] = [];
      for (let i = 0; i < e.itd_k.length; i++) {
        const m = e.meter_kw[i];
        const q = e.balance_kw[i];
        if (m !== null && m !== undefined && q !== null && q !== undefined) d.push(m - q);
      }
      return d.length >= o.min_windows_per_trip ? [median(d)] : [];
    }),
  );
  return perBand[0]!.length >= perBand[1]!.length ? perBand[0]! : perBand[1]!;
}

/** The heat-balance intercept: balance/x = k_(trip,band) − Q_aux/x over windows without a flow meter. */
function balanceIntercept(
  trips: readonly HeatTrip[],
  shape: { airside: Airside; area_m2: number },
  o: typeof UNMEASURED_HEAT_DEFAULTS,
  judged: (value: number, ci: [number, number], n: number) => UnmeasuredHeat,
  none: (reason: string, n: number) => UnmeasuredHeat,
): UnmeasuredHeat {
  const y: number[] = [];
  const u: number[] = [];
  const group: number[] = [];
  const cluster: number[] = [];
  let groups = 0;
  let clusters = 0;
  for (const t of trips) {
    let used = false;
    for (const band of BAND_NAMES) {
      const e = t.windows[band];
      const at: number[] = [];
      for (let i = 0; i < e.itd_k.length; i++)
        if (e.meter_kw[i] === null && e.balance_kw[i] !== null && e.itd_k[i]! - t.ambient_correction_k > 0)
          at.push(i);
      if (at.length < o.min_windows_per_trip) continue;
      for (const i of at) {
        // kW per W/(m²·K): the heat a k of 1 would reject in this window.
        const x =
          (shape.area_m2 *
            bandFactor(shape.airside, band, e.speed_kmh[i]!, e.fan_pct[i]!) *
            (e.itd_k[i]! - t.ambient_correction_k)) /
          1000;
        y.push(e.balance_kw[i]! / x);
        u.push(1 / x);
        group.push(groups);
        cluster.push(clusters);
      }
      groups++;
      used = true;
    }
    if (used) clusters++;
  }
  if (clusters < o.min_trips)
    return none(`heat-balance windows on ${clusters} trips, need ${o.min_trips}`, clusters);
  const f = huberFit(
    {
      n: y.length,
      p: 1,
      group: Int32Array.from(group),
      groups,
      cluster: Int32Array.from(cluster),
      clusters,
      evaluate(theta, e, J) {
        for (let i = 0; i < y.length; i++) {
          e[i] = y[i]! + theta[0]! * u[i]!;
          J[i] = u[i]!;
        }
      },
    },
    [0],
  );
  const value = f.theta[0]!;
  const half = f.half95[0]!;
  if (!Number.isFinite(half))
    return none('the heat balance did not vary enough to read an intercept', clusters);
  return judged(value, [value - half, value + half], clusters);
}
