import type { TripResult, VehicleResult } from '@thermargin/shared';
import { maintenanceTime_ms } from '../health/rebaseline.ts';
import {
  AIRSIDE_FIT_DEFAULTS,
  type AirsideFitResult,
  fitAirside,
  learnedAirside,
} from '../radiator/airside-fit.ts';
import { type AmbientOffset, ambientOffset } from '../trip/ambient-offset.ts';
import { medianK, scatterCi95 } from '../trip/band-estimate.ts';
import { robustSigma } from '../stats/mad.ts';
import { median } from '../stats/quantile.ts';
import { BAND_NAMES, type Band } from '../trip/bands.ts';
import { designMargin } from '../trip/design-point.ts';
import { ESTIMATOR_DEFAULTS } from '../trip/estimator-options.ts';
import { type Referral, windowK_w_m2k } from '../trip/refer.ts';
import { type UnmeasuredHeat, unmeasuredHeat } from '../trip/unmeasured-heat.ts';
import { type FigureUncertainty, figureHalfWidth, figureUncertainty, widened } from './figure-uncertainty.ts';
import type { VehicleModel } from './resolve.ts';
import { roundTo as round } from '../stats/round.ts';

/** What the vehicle stage learned from all the vehicle's trips, and the trips referred with it. */
export interface VehicleLearning {
  /** The vehicle with the learned air side and unmeasured heat. */
  vehicle: VehicleModel;
  /** The trips in input order: k, margin and limiting ambient referred again where they carry windows. */
  trips: TripResult[];
  airside: AirsideFitResult;
  unmeasured: UnmeasuredHeat;
  /** One per sensor period (split at sensor_replaced), oldest first. */
  ambient: (AmbientOffset & { from_ms: number | null })[];
}

const NO_WINDOW = (b: Band) =>
  `${b} band: no window with positive heat and ITD after the vehicle's corrections`;
const opt = (x: number | null, d: number) => (x === null ? null : round(x, d));

/**
 * The vehicle stage's learning (docs/airside-learning.md): the ambient offset per sensor period from
 * the key-on soak checks, the unmeasured heat from flow-meter windows (trip/unmeasured-heat.ts), then
 * the air-side shape from the windows of all trips (radiator/airside-fit.ts), then every trip's band k, margin and limiting ambient referred again with
 * them. A function of the set of trips alone (ordered here by start, then id), so the analyzer, which
 * adds trips as they end, and the offline CLI, which has them all, give the same figures; trips
 * without windows (results kept from before) pass unchanged.
 */
export function learnVehicle(given: VehicleModel, trips: readonly TripResult[]): VehicleLearning {
  // A vehicle this stage already learned learns again from the fleet file's model it came from.
  const v = given.learned_from ?? given;
  const order = trips
    .map((t, i) => ({ i, ms: Date.parse(t.start), id: t.trip }))
    .sort((a, b) => a.ms - b.ms || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0))
    .map((x) => x.i);
  const ambient = ambientPeriods(v, trips, order);
  const period = (t: TripResult) => {
    const ms = Date.parse(t.start);
    const p = ambient.findLast((a) => a.from_ms === null || a.from_ms <= ms);
    return p?.applied ? p : null;
  };
  const correction = (t: TripResult) => period(t)?.value_k ?? 0;
  const withWindows = order.flatMap((i) => {
    const t = trips[i]!;
    return t.windows ? [{ windows: t.windows, ambient_correction_k: correction(t) }] : [];
  });
  // The shape and the unmeasured heat each need the other: the shape with the prior heat, the heat
  // with that shape, then the shape again with the heat.
  // Common practice: a combustion engine drives its coolant pump; electric drivetrains pump electrically.
  const engine_pump = v.powertrain === 'ice';
  const shapeWith = (aux_kw: number) =>
    fitAirside(
      { airside: v.airside, basis: v.airside_basis, unmeasured_heat_kw: aux_kw, engine_pump },
      withWindows,
      AIRSIDE_FIT_DEFAULTS,
    );
  const first = shapeWith(v.aux_heat_kw);
  const unmeasured = unmeasuredHeat(v.aux_heat_known ? v.aux_heat_kw : null, withWindows, {
    airside: first.airside,
    area_m2: v.radiator_area_m2,
    engine_pump,
  });
  const aux_heat_kw = unmeasured.basis === 'none' ? v.aux_heat_kw : unmeasured.value_kw;
  const fit = aux_heat_kw === v.aux_heat_kw ? first : shapeWith(aux_heat_kw);
  const vehicle: VehicleModel = { ...v, airside: fit.airside, aux_heat_kw, learned_from: v };
  const referral = (t: TripResult): Referral => ({
    airside: fit.airside,
    unmeasured_heat_kw: aux_heat_kw,
    ambient_correction_k: correction(t),
  });
  const sigma = windowScatter(vehicle, trips, referral);
  const figuresOff = figureUncertainty(fit, unmeasured);
  const uncertainty = (t: TripResult): FigureUncertainty => {
    const ci = period(t)?.ci95;
    return { ...figuresOff, ambient_half95_k: ci ? (ci[1] - ci[0]) / 2 : 0 };
  };
  const out = trips.map((t) => {
    if (!t.windows) return t;
    const r = referral(t);
    const corr = r.ambient_correction_k;
    const u = uncertainty(t);
    const figures = refer(vehicle, t, r, sigma, u);
    // A stored result's trip keeps its own margin aside (trip_margin_*, health/trip-margins.ts); the
    // margin made here replaces it, or a trip kept from before a late one would keep a stale figure.
    const {
      ambient_correction_k: _a,
      uncorrected: _u,
      trip_margin_pct: _m,
      trip_limiting_ambient_c: _l,
      trip_margin_basis: _b,
      ...rest
    } = t;
    if (corr === 0) return { ...rest, ...figures };
    const raw = refer(vehicle, t, { ...r, ambient_correction_k: 0 }, sigma, { ...u, ambient_half95_k: 0 });
    return {
      ...rest,
      ...figures,
      ambient_correction_k: corr,
      uncorrected: {
        k_ram_w_m2k: raw.k_ram_w_m2k,
        k_fan_w_m2k: raw.k_fan_w_m2k,
        margin_pct: raw.margin_pct,
        limiting_ambient_c: raw.limiting_ambient_c,
      },
    };
  });
  return { vehicle, trips: out, airside: fit, unmeasured, ambient };
}

/**
 * Robust σ of ln window k about its trip's band median, over the trips with ≥ 2 windows in a band
 * (1.4826·MAD, Hampel 1974): the interval of a trip with fewer windows than an order-statistic interval
 * needs. Null with fewer than 10 such deviations.
 */
function windowScatter(
  v: VehicleModel,
  trips: readonly TripResult[],
  referral: (t: TripResult) => Referral,
): number | null {
  const dev: number[] = [];
  for (const t of trips) {
    if (!t.windows) continue;
    for (const b of BAND_NAMES) {
      const k = windowK_w_m2k(b, t.windows[b], v.radiator_area_m2, referral(t)).filter((x) => x > 0);
      if (k.length < 2) continue;
      const m = median(k);
      for (const x of k) dev.push(Math.log(x / m));
    }
  }
  return dev.length >= 10 ? robustSigma(dev) : null;
}

/**
 * A trip's k per band, margin and limiting ambient under a referral (its windows must be present). The
 * interval of k carries the windows' scatter and how far the figures referred with may be off.
 */
function refer(v: VehicleModel, t: TripResult, r: Referral, sigma: number | null, u: FigureUncertainty) {
  const k = {} as Record<Band, ReturnType<typeof medianK>>;
  for (const b of BAND_NAMES) {
    const e = t.windows![b];
    const windows = windowK_w_m2k(b, e, v.radiator_area_m2, r);
    const m = medianK(windows, ESTIMATOR_DEFAULTS);
    const ci = m?.ci95 ?? (m && sigma !== null ? scatterCi95(m.k_w_m2k, m.windows, sigma) : null);
    k[b] = m && ci ? { ...m, ci95: widened(m.k_w_m2k, ci, figureHalfWidth(b, e, windows, r, u)) } : m;
  }
  const m = designMargin(v, { ram: k.ram?.k_w_m2k ?? null, fan: k.fan?.k_w_m2k ?? null });
  const ci = (x: [number, number] | null | undefined) =>
    x ? ([round(x[0], 1), round(x[1], 1)] as [number, number]) : null;
  return {
    k_ram_w_m2k: opt(k.ram?.k_w_m2k ?? null, 1),
    k_ram_ci95: ci(k.ram?.ci95),
    k_ram_reason: k.ram ? null : (t.k_ram_reason ?? NO_WINDOW('ram')),
    k_fan_w_m2k: opt(k.fan?.k_w_m2k ?? null, 1),
    k_fan_ci95: ci(k.fan?.ci95),
    k_fan_reason: k.fan ? null : (t.k_fan_reason ?? NO_WINDOW('fan')),
    margin_pct: opt(m.margin_pct, 2),
    limiting_ambient_c: opt(m.limiting_ambient_c, 2),
    margin_basis: m.basis,
  };
}

/** The ambient offset of each sensor period: checks since the last sensor_replaced. */
function ambientPeriods(
  v: VehicleModel,
  trips: readonly TripResult[],
  order: readonly number[],
): VehicleLearning['ambient'] {
  const cuts = v.maintenance.filter((m) => m.action === 'sensor_replaced').map(maintenanceTime_ms);
  const starts: (number | null)[] = [null, ...cuts];
  return starts.map((from, p) => {
    const to = p + 1 < starts.length ? starts[p + 1]! : Number.POSITIVE_INFINITY;
    const checks = order
      .map((i) => trips[i]!)
      .filter((t) => {
        const ms = Date.parse(t.start);
        return t.soak_offset_k !== null && (from === null || ms >= from) && ms < to;
      })
      .map((t) => t.soak_offset_k!);
    return { ...ambientOffset(checks), from_ms: from };
  });
}

/**
 * The referral a stored trip's figures were made with, rebuilt from its vehicle's stored result (the
 * API's per-sample trace shows k and heat rejected with it); the fleet file's when the result has no fit.
 */
export function storedReferral(
  v: VehicleModel,
  r: Pick<VehicleResult, 'airside_fit' | 'unmeasured_heat'>,
  t: Pick<TripResult, 'ambient_correction_k'>,
): Referral {
  const airside = r.airside_fit ? learnedAirside(v.airside, r.airside_fit) : v.airside;
  const heat = r.unmeasured_heat;
  return {
    airside,
    unmeasured_heat_kw: heat && heat.basis !== 'none' ? heat.value_kw : v.aux_heat_kw,
    ambient_correction_k: t.ambient_correction_k ?? 0,
  };
}

/** The contract's form of what the vehicle stage learned. */
export function learnedFields(
  l: VehicleLearning,
): Pick<VehicleResult, 'airside_fit' | 'unmeasured_heat' | 'ambient_offset'> {
  const { airside: f } = l;
  const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString());
  return {
    airside_fit: {
      velocity_exponent: f.velocity_exponent,
      fan_velocity_exponent: f.fan_velocity_exponent,
      ram_face_ratio: f.ram_face_ratio,
      fan_face_velocity_ms: f.fan_face_velocity_ms,
      windows: f.windows,
      trips: f.trips,
      notes: f.notes,
    },
    unmeasured_heat: l.unmeasured,
    ambient_offset: l.ambient.map(({ from_ms, ...a }) => ({ from: iso(from_ms), ...a })),
  };
}
