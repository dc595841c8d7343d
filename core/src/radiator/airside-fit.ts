import type { BandWindowsEvidence, FittedFigure } from '@thermargin/shared';
import { HUBER_DEFAULTS, huberFit, type RobustProblem } from '../stats/huber.ts';
import { type Airside, FAN_REFERENCE, RAM_REFERENCE } from './airside.ts';

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
  /** –, ln 1.5: the ram-to-fan face-velocity ratio is fitted when its 95 % interval is within ×/÷ 1.5. */
  max_log_ratio_half95: Math.log(1.5),
  /** Bounds the fit may not leave: exponents 0.2–1.2 (the fleet file's range), ratio ×/÷ 4 of the prior. */
  exponent_bounds: [0.2, 1.2] as [number, number],
  log_ratio_span: Math.log(4),
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

/** One trip's windows as the fit reads them; itd already corrected for the trip's ambient offset. */
export interface FitTrip {
  windows: { ram: BandWindowsEvidence; fan: BandWindowsEvidence };
  /** K added to the measured ambient on this trip. */
  ambient_correction_k: number;
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

type Param = 'n_ram' | 'n_fan' | 'log_ratio' | 'flow';

const S_REF = { ram: (RAM_REFERENCE.speed_kmh / 3.6) ** 2, fan: (FAN_REFERENCE.speed_kmh / 3.6) ** 2 };
const D_REF = { ram: (RAM_REFERENCE.fan_pct / 100) ** 2, fan: (FAN_REFERENCE.fan_pct / 100) ** 2 };

/** The windows flattened: band (0 ram, 1 fan), air condition, log ITD, heats, group and cluster. */
interface Data {
  n: number;
  band: Uint8Array;
  /** (m/s)² of road speed and (fan duty share)². */
  s: Float64Array;
  d: Float64Array;
  /** ln of the corrected ITD and of the heat rejected (kW). */
  logItd: Float64Array;
  logQ: Float64Array;
  /** ln of the coolant flow less its mean over windows that have one; 0 where none. */
  logFlow: Float64Array;
  group: Int32Array;
  groups: number;
  cluster: Int32Array;
  clusters: number;
  /** Trips with ≥ min_windows_per_trip windows, per band, and with a flow meter. */
  tripsWith: { ram: number; fan: number; flow: number };
}

/** x less the mean of its finite values, with 0 for NaN. */
function centred(x: Float64Array): Float64Array {
  let n = 0;
  let s = 0;
  for (const v of x)
    if (!Number.isNaN(v)) {
      n++;
      s += v;
    }
  const m = n > 0 ? s / n : 0;
  return x.map((v) => (Number.isNaN(v) ? 0 : v - m));
}

function flatten(trips: readonly FitTrip[], o: AirsideFitOptions, aux_kw: number): Data {
  const rows: { b: number; s: number; d: number; li: number; q: number; lf: number; g: number; c: number }[] =
    [];
  const tripsWith = { ram: 0, fan: 0, flow: 0 };
  let groups = 0;
  trips.forEach((t, c) => {
    let withFlow = false;
    for (const [b, band] of [
      [0, 'ram'],
      [1, 'fan'],
    ] as const) {
      const e = t.windows[band];
      const keep: number[] = [];
      for (let i = 0; i < e.itd_k.length; i++) {
        const q = e.meter_kw[i] ?? (e.balance_kw[i] ?? Number.NaN) + aux_kw;
        if (e.itd_k[i]! - t.ambient_correction_k > 0 && q > 0) keep.push(i);
      }
      if (keep.length < o.min_windows_per_trip) continue;
      tripsWith[band]++;
      if (keep.some((i) => e.flow_lpm[i])) withFlow = true;
      for (const i of keep) {
        rows.push({
          b,
          s: (e.speed_kmh[i]! / 3.6) ** 2,
          d: (e.fan_pct[i]! / 100) ** 2,
          li: Math.log(e.itd_k[i]! - t.ambient_correction_k),
          q: e.meter_kw[i] ?? e.balance_kw[i]! + aux_kw,
          lf: e.flow_lpm[i] ? Math.log(e.flow_lpm[i]!) : Number.NaN,
          g: groups,
          c,
        });
      }
      groups++;
    }
    if (withFlow) tripsWith.flow++;
  });
  const n = rows.length;
  const col = (f: (r: (typeof rows)[number]) => number) => Float64Array.from(rows, f);
  return {
    n,
    band: Uint8Array.from(rows, (r) => r.b),
    s: col((r) => r.s),
    d: col((r) => r.d),
    logItd: col((r) => r.li),
    logQ: col((r) => Math.log(r.q)),
    logFlow: centred(col((r) => r.lf)),
    group: Int32Array.from(rows, (r) => r.g),
    groups,
    cluster: Int32Array.from(rows, (r) => r.c),
    clusters: trips.length,
    tripsWith,
  };
}

/**
 * The fit's model of window i in band b of trip t (field notes: Q = k·A·ITD; k ∝ v_face^n, airside.ts):
 *   ln(Q_i) − ln(ITD_i) = a_(t,b) + n_b · L_i(ρ),   L_i = ½·ln((ρ²·S_i + D_i) / (ρ²·S_ref,b + D_ref,b))
 * with v_face = v_fan·√(ρ²·S + D), S = (speed/3.6)², D = (duty/100)², ρ = ram_face_ratio / v_fan, and
 * Q the flow meter's heat or else the heat balance plus the unmeasured heat (given). The level a_(t,b) per trip
 * and band takes k's level (fouling, coolant flow, the area) so only variation within a trip fits the
 * shape. Only ρ is identified, not v_fan and the ram ratio apart: scaling both scales every v_face alike.
 */
function problem(
  D: Data,
  free: readonly Param[],
  fixed: Record<Param, number>,
  o: AirsideFitOptions,
  priorLogRatio: number,
  /** The fan band takes the ram band's exponent. */
  tie: boolean,
): RobustProblem {
  const idx = (p: Param) => free.indexOf(p);
  const lower = free.map((p) =>
    p === 'log_ratio' ? priorLogRatio - o.log_ratio_span : o.exponent_bounds[0],
  );
  const upper = free.map((p) =>
    p === 'log_ratio' ? priorLogRatio + o.log_ratio_span : o.exponent_bounds[1],
  );
  const P = free.length;
  return {
    n: D.n,
    p: P,
    group: D.group,
    groups: D.groups,
    cluster: D.cluster,
    clusters: D.clusters,
    lower,
    upper,
    evaluate(theta, e, J) {
      const get = (p: Param) => (idx(p) >= 0 ? theta[idx(p)]! : fixed[p]);
      const rho2 = Math.exp(2 * get('log_ratio'));
      const n = [get('n_ram'), tie ? get('n_ram') : get('n_fan')];
      const ref = [
        0.5 * Math.log(rho2 * S_REF.ram + D_REF.ram),
        0.5 * Math.log(rho2 * S_REF.fan + D_REF.fan),
      ];
      const dRef = [
        (rho2 * S_REF.ram) / (rho2 * S_REF.ram + D_REF.ram),
        (rho2 * S_REF.fan) / (rho2 * S_REF.fan + D_REF.fan),
      ];
      const jn = [idx('n_ram'), tie ? idx('n_ram') : idx('n_fan')];
      const jr = idx('log_ratio');
      const jf = idx('flow');
      const cf = jf >= 0 ? theta[jf]! : 0;
      for (let i = 0; i < D.n; i++) {
        const b = D.band[i]!;
        const v2 = rho2 * D.s[i]! + D.d[i]!;
        const L = 0.5 * Math.log(v2) - ref[b]!;
        e[i] = D.logQ[i]! - D.logItd[i]! - n[b]! * L - cf * D.logFlow[i]!;
        const row = i * P;
        for (let j = 0; j < P; j++) J[row + j] = 0;
        if (jn[b]! >= 0) J[row + jn[b]!] = -L;
        if (jr >= 0) J[row + jr] = -n[b]! * ((rho2 * D.s[i]!) / v2 - dRef[b]!);
        if (jf >= 0) J[row + jf] = -D.logFlow[i]!;
      }
    },
  };
}

const WORDS: Record<Param, string> = {
  n_ram: 'ram-band exponent',
  n_fan: 'fan-band exponent',
  log_ratio: 'ram-to-fan face-velocity ratio',
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
  const priorLogRatio = Math.log(a.ram_face_ratio / a.fan_face_velocity_ms);
  const fixed: Record<Param, number> = {
    n_ram: a.velocity_exponent,
    n_fan: a.fan_velocity_exponent ?? a.velocity_exponent,
    log_ratio: priorLogRatio,
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
  const only = (globalThis as { AIRSIDE_FREE?: string[] }).AIRSIDE_FREE;
  if (!only || only.includes('n_ram')) need('n_ram', D.tripsWith.ram);
  if (!only || only.includes('n_fan')) need('n_fan', D.tripsWith.fan);
  // With an engine-driven pump the coolant flow follows road speed: in the fan band, how k varies with
  // speed is then the flow's doing as much as the ram air's, and only a flow meter tells them apart.
  if (prior.engine_pump && D.tripsWith.flow < o.min_trips)
    notes.push(
      `${WORDS.log_ratio}: the engine drives the coolant pump and no flow meter separates its flow from ram air`,
    );
  else if (!only || only.includes('log_ratio')) need('log_ratio', D.tripsWith.fan);
  // Coolant flow changes k too (engine-driven pumps follow engine speed, thermostats throttle): where a
  // flow meter gives it, its term keeps that change out of the air-side shape. It only serves the fit:
  // k stays referred at the flow the trip had.
  if ((!only || only.includes('flow')) && D.tripsWith.flow >= o.min_trips && spread(D) > 1e-3)
    free.push('flow');
  let fit = null as ReturnType<typeof huberFit> | null;
  while (free.length > 0) {
    // The fan band follows the ram band's exponent while its own is not fitted.
    const tie = !free.includes('n_fan') && a.fan_velocity_exponent === undefined;
    const P = problem(D, free, fixed, o, priorLogRatio, tie);
    fit = huberFit(
      P,
      free.map((p) => fixed[p]),
      HUBER_DEFAULTS,
    );
    const f = fit;
    const excess = free.map((p, j) => {
      const half = f.half95[j]!;
      if (p === 'flow') return Number.isFinite(half) ? 0 : Number.POSITIVE_INFINITY;
      if (!Number.isFinite(half)) return Number.POSITIVE_INFINITY;
      return half / (p === 'log_ratio' ? o.max_log_ratio_half95 : o.max_exponent_half95);
    });
    const worst = excess.indexOf(Math.max(...excess));
    if (!(excess[worst]! > 1)) break;
    const p = free[worst]!;
    notes.push(
      `${WORDS[p]}: 95 % interval ± ${f.half95[worst]!.toFixed(3)}${p === 'log_ratio' ? ' (log)' : ''} too wide`,
    );
    free.splice(worst, 1);
    fit = null;
  }
  return assemble(prior, fixed, free, fit, D, notes);
}

/** Pooled within-group standard deviation of ln flow: whether the flow varies enough to fit its term. */
function spread(D: Data): number {
  const sum = new Float64Array(D.groups);
  const sum2 = new Float64Array(D.groups);
  const n = new Float64Array(D.groups);
  for (let i = 0; i < D.n; i++) {
    const g = D.group[i]!;
    n[g]!++;
    sum[g]! += D.logFlow[i]!;
    sum2[g]! += D.logFlow[i]! ** 2;
  }
  let ss = 0;
  let N = 0;
  for (let g = 0; g < D.groups; g++) {
    if (n[g]! < 2) continue;
    ss += sum2[g]! - sum[g]! ** 2 / n[g]!;
    N += n[g]! - 1;
  }
  return N > 0 ? Math.sqrt(Math.max(0, ss) / N) : 0;
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
  const ratio = figure('log_ratio', prior.basis.ram_face_ratio, (x) => Math.exp(x) * vf);
  const round = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;
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
