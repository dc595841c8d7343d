import type { FittedFigure } from '@thermargin/shared';
import { HUBER_DEFAULTS, huberFit } from '../stats/huber.ts';
import type { Airside } from './airside.ts';
import {
  type Data,
  type FitTrip,
  flatten,
  type Param,
  problem,
  S_EDGE,
  spread,
} from './airside-window-model.ts';
import { roundTo as round } from '../stats/round.ts';

export type { FitTrip } from './airside-window-model.ts';

/** Rules of the per-vehicle air-side fit; defaults defined once here, each says why. */
export const AIRSIDE_FIT_DEFAULTS = {
  /** trips, 5: fewest trips with windows in a band before its shape is fitted (the interval needs
   *  trips as clusters: Student's t with 4 degrees of freedom is 2.78). */
  min_trips: 5,
  /** windows, 2: a trip counts for a band with at least this many windows (one gives no variation). */
  min_windows_per_trip: 2,
  /** trips, 200: the newest trips the fit reads, so its cost stays bounded on a long history. */
  max_trips: 200,
  /** –, 0.15: an exponent is fitted when its 95 % interval is at most ± this (the common-practice
   *  range 0.4–0.8 is ± 0.2 about its middle, so a fit must say more than the range does). */
  max_exponent_half95: 0.15,
  /** –, 0.04: the ram-to-fan face-velocity ratio is fitted when its 95 % interval moves k at the fan
   *  band's edge (20 km/h, fan 100 %) by at most ±4 %: the ratio matters only through that mixing, and
   *  a small ratio is bounded from above long before its logarithm is. The prior is no surer: the
   *  defaults' ranges (3–8 m/s of face velocity at highway speed, 1.5–4 m/s from the fan) move k there
   *  by up to 13 %, and with a fan pulling, ram air adds less than the root-sum-square of airside.ts
   *  (the fan's pressure falls as the flow rises), which only a fitted ratio takes in. */
  max_ratio_edge_half95: 0.04,
  /** Bounds the fit may not leave: exponents 0.2–1.2 (the fleet file's range), ratio ×/÷ 4 of the prior. */
  exponent_bounds: [0.2, 1.2] as [number, number],
  max_ratio_over_prior: 4,
  /** Bounds of the coolant-flow exponent: 0 (k blind to the flow) to 0.8 (the coolant side alone, its
   *  h ∝ V̇^0.8 by Dittus–Boelter). */
  flow_exponent_bounds: [0, 0.8] as [number, number],
} as const;

export type AirsideFitOptions = typeof AIRSIDE_FIT_DEFAULTS;

/** The fitted figures as results report them (rounded: the shape refers with these values). */
export interface AirsideFigures {
  velocity_exponent: FittedFigure;
  /** The fan band's own exponent when fitted; else the ram band's figure (or the prior's). */
  fan_velocity_exponent: FittedFigure;
  ram_face_ratio: FittedFigure;
  fan_face_velocity_ms: FittedFigure;
}

/**
 * The air side to refer with, from the prior and the reported figures: a fitted figure's value, the
 * prior's exact value elsewhere (so a vehicle with nothing fitted refers exactly as its trips did). The
 * fan band takes its own fitted exponent, else the ram band's fitted one, else the prior's. Rebuilding
 * it from stored results gives the shape the figures were made with.
 */
export function learnedAirside(prior: Airside, f: AirsideFigures): Airside {
  const fitted = (x: FittedFigure, otherwise: number) => (x.basis === 'fitted' ? x.value : otherwise);
  const ram = fitted(f.velocity_exponent, prior.velocity_exponent);
  const fan =
    f.fan_velocity_exponent.basis === 'fitted'
      ? f.fan_velocity_exponent.value
      : f.velocity_exponent.basis === 'fitted'
        ? ram
        : prior.fan_velocity_exponent;
  return {
    ram_face_ratio: fitted(f.ram_face_ratio, prior.ram_face_ratio),
    fan_face_velocity_ms: prior.fan_face_velocity_ms,
    velocity_exponent: ram,
    ...(fan === undefined ? {} : { fan_velocity_exponent: fan }),
  };
}

export interface AirsideFitResult extends AirsideFigures {
  /** The shape to refer with: fitted figures where the data carried them, the prior elsewhere. */
  airside: Airside;
  windows: number;
  trips: number;
  /** Why figures fell back to the prior, in words; empty when all were fitted. */
  notes: string[];
}

/** What the fit starts from: the fleet file's figures or the defaults. */
export interface FitPrior {
  airside: Airside;
  basis: Record<'ram_face_ratio' | 'fan_face_velocity_ms' | 'velocity_exponent', 'fleet_file' | 'default'>;
  /** kW of unmeasured heat added to the heat balance of windows without a flow meter. */
  unmeasured_heat_kw: number;
  /** Whether the coolant pump is driven by the engine, so coolant flow follows road speed. */
  engine_pump: boolean;
}

/** The figures from the least to the most firmly carried by the data. */
const WEAKEST: readonly Param[] = ['rho2', 'n_fan', 'flow', 'n_ram'];

const WORDS: Record<Param, string> = {
  n_ram: 'ram-band exponent',
  n_fan: 'fan-band exponent',
  rho2: 'ram-to-fan face-velocity ratio',
  flow: 'coolant-flow exponent',
};

/**
 * The vehicle's air-side shape from its own windows: a Huber fit
 * (stats/huber.ts) of the model above with a level per trip and band, intervals clustered by trip.
 * Each figure is fitted only where the data carry it — enough trips with windows in its band, and a
 * 95 % interval within the bounds of AIRSIDE_FIT_DEFAULTS — else it stays at the fleet file's value or the default, and a note says why. The
 * fan band takes the ram band's exponent when it has none of its own. Deterministic in the trips' order.
 */
export function fitAirside(
  prior: FitPrior,
  trips: readonly FitTrip[],
  o: AirsideFitOptions = AIRSIDE_FIT_DEFAULTS,
): AirsideFitResult {
  const a = prior.airside;
  const priorRho2 = (a.ram_face_ratio / a.fan_face_velocity_ms) ** 2;
  const fixed: Record<Param, number> = {
    n_ram: a.velocity_exponent,
    n_fan: a.fan_velocity_exponent ?? a.velocity_exponent,
    rho2: priorRho2,
    flow: 0,
  };
  const recent = trips.slice(-o.max_trips);
  const D = flatten(recent, o, prior.unmeasured_heat_kw);
  const notes: string[] = [];
  const free: Param[] = [];
  const need = (what: Param, have: number) => {
    if (have >= o.min_trips) free.push(what);
    else notes.push(`${WORDS[what]}: windows on ${have} trips, need ${o.min_trips}`);
  };
  need('n_ram', D.tripsWith.ram);
  need('n_fan', D.tripsWith.fan);
  // With an engine-driven pump the coolant flow follows road speed: in the fan band, how k varies with
  // speed is then the flow's doing as much as the ram air's, and only a flow meter tells them apart.
  if (prior.engine_pump && D.tripsWith.flow < o.min_trips)
    notes.push(
      `${WORDS.rho2}: the engine drives the coolant pump and no flow meter separates its flow from ram air`,
    );
  else need('rho2', D.tripsWith.fan);
  // Coolant flow changes k too (engine-driven pumps follow engine speed, thermostats throttle): where a
  // flow meter gives it, its term keeps that change out of the air-side shape. It only serves the fit:
  // k stays referred at the flow the trip had.
  if (D.tripsWith.flow >= o.min_trips && spread(D) > 1e-3) free.push('flow');
  let fit = null as ReturnType<typeof huberFit> | null;
  while (free.length > 0) {
    // The fan band follows the ram band's exponent while its own is not fitted.
    const tie = !free.includes('n_fan') && a.fan_velocity_exponent === undefined;
    const P = problem(D, free, fixed, o, priorRho2, tie);
    fit = huberFit(
      P,
      free.map((p) => fixed[p]),
      HUBER_DEFAULTS,
    );
    const f = fit;
    const lo = P.lower!;
    const hi = P.upper!;
    const atBound = (j: number) => f.theta[j]! <= lo[j]! + 1e-12 || f.theta[j]! >= hi[j]! - 1e-12;
    const excess = free.map((p, j) => {
      const half = f.half95[j]!;
      if (atBound(j) || !Number.isFinite(half)) return Number.POSITIVE_INFINITY;
      if (p === 'flow') return 0;
      if (p !== 'rho2') return half / o.max_exponent_half95;
      // The interval's effect on ln k at the fan band's edge: n·½·S/(ρ²·S + 1) per unit of ρ².
      const rho2 = f.theta[j]!;
      const nFan = f.theta[free.indexOf('n_fan')] ?? f.theta[free.indexOf('n_ram')] ?? fixed.n_fan;
      return (((0.5 * nFan * S_EDGE) / (rho2 * S_EDGE + 1)) * half) / o.max_ratio_edge_half95;
    });
    // The worst figure goes back to its prior; among equals (an ill-posed fit gives every interval NaN)
    // the one the data carry least.
    const worst = free.reduce(
      (w, p, j) =>
        excess[j]! > excess[w]! || (excess[j] === excess[w] && WEAKEST.indexOf(p) < WEAKEST.indexOf(free[w]!))
          ? j
          : w,
      0,
    );
    if (!(excess[worst]! > 1)) break;
    const p = free[worst]!;
    notes.push(
      atBound(worst)
        ? `${WORDS[p]}: the fit ran to the edge of its plausible range`
        : `${WORDS[p]}: 95 % interval ${p === 'rho2' ? `moves k at the fan band's edge by more than ±${o.max_ratio_edge_half95 * 100} %` : `± ${f.half95[worst]!.toFixed(3)} too wide`}`,
    );
    free.splice(worst, 1);
    fit = null;
  }
  return assemble(prior, fixed, free, fit, D, notes);
}

function assemble(
  prior: FitPrior,
  fixed: Record<Param, number>,
  free: readonly Param[],
  fit: ReturnType<typeof huberFit> | null,
  D: Data,
  notes: string[],
): AirsideFitResult {
  const a = prior.airside;
  const at = (p: Param) => {
    const j = free.indexOf(p);
    if (j < 0 || !fit) return null;
    return { value: fit.theta[j]!, half: fit.half95[j]! };
  };
  const figure = (p: Param, priorBasis: FittedFigure['basis'], map = (x: number) => x): FittedFigure => {
    const f = at(p);
    return f
      ? { value: map(f.value), ci95: [map(f.value - f.half), map(f.value + f.half)], basis: 'fitted' }
      : { value: map(fixed[p]), ci95: null, basis: priorBasis };
  };
  const vf = a.fan_face_velocity_ms;
  const nRam = figure('n_ram', prior.basis.velocity_exponent);
  const nFan = at('n_fan') !== null ? figure('n_fan', prior.basis.velocity_exponent) : { ...nRam };
  const ratio = figure('rho2', prior.basis.ram_face_ratio, (x) => Math.sqrt(Math.max(0, x)) * vf);
  const r = (f: FittedFigure, d: number): FittedFigure => ({
    value: round(f.value, d),
    ci95: f.ci95 ? [round(f.ci95[0], d), round(f.ci95[1], d)] : null,
    basis: f.basis,
  });
  const figures = {
    velocity_exponent: r(nRam, 3),
    fan_velocity_exponent: r(nFan, 3),
    ram_face_ratio: r(ratio, 4),
    fan_face_velocity_ms: r({ value: vf, ci95: null, basis: prior.basis.fan_face_velocity_ms }, 3),
  };
  return {
    airside: learnedAirside(a, figures),
    ...figures,
    windows: D.n,
    trips: D.clusters,
    notes,
  };
}
