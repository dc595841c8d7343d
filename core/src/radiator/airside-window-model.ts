import type { BandWindowsEvidence } from '@thermargin/shared';
import type { RobustProblem } from '../stats/huber.ts';
import { BANDS } from '../trip/bands.ts';
import { FAN_REFERENCE, RAM_REFERENCE } from './airside.ts';
import type { AirsideFitOptions } from './airside-fit.ts';

/**
 * The air-side fit's data and model (airside-fit.ts makes the decisions): windows flattened into
 * columns, and the robust problem of their k against the air condition.
 */

/** The windows of one trip as the air-side fit reads them. */
export interface FitTrip {
  windows: { ram: BandWindowsEvidence; fan: BandWindowsEvidence };
  /** K added to the measured ambient on this trip. */
  ambient_correction_k: number;
}

/** The figures the fit can free: the two bands' exponents, ρ² and the coolant-flow term. */
export type Param = 'n_ram' | 'n_fan' | 'rho2' | 'flow';

const S_REF = { ram: (RAM_REFERENCE.speed_kmh / 3.6) ** 2, fan: (FAN_REFERENCE.speed_kmh / 3.6) ** 2 };
/** (m/s)² of the fan band's edge, 20 km/h. */
export const S_EDGE = (BANDS.fan.max_speed_kmh / 3.6) ** 2;
const D_REF = { ram: (RAM_REFERENCE.fan_pct / 100) ** 2, fan: (FAN_REFERENCE.fan_pct / 100) ** 2 };

/** The windows flattened: band (0 ram, 1 fan), air condition, log ITD, heats, group and cluster. */
export interface Data {
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

export function flatten(trips: readonly FitTrip[], o: AirsideFitOptions, aux_kw: number): Data {
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
 * The fit's model of window i in band b of trip t (the rating equation Q = k·A·ITD, common practice; k ∝ v_face^n as in airside.ts):
 *   ln(Q_i) − ln(ITD_i) = a_(t,b) + n_b · L_i(ρ),   L_i = ½·ln((ρ²·S_i + D_i) / (ρ²·S_ref,b + D_ref,b))
 * with v_face = v_fan·√(ρ²·S + D), S = (speed/3.6)², D = (duty/100)², ρ = ram_face_ratio / v_fan (fitted
 * as ρ², whose effect on k is linear near zero), and
 * Q the flow meter's heat or else the heat balance plus the unmeasured heat (given). The level a_(t,b) per trip
 * and band takes k's level (fouling, coolant flow, the area) so only variation within a trip fits the
 * shape. Only ρ is identified, not v_fan and the ram ratio apart: scaling both scales every v_face alike.
 */
export function problem(
  D: Data,
  free: readonly Param[],
  fixed: Record<Param, number>,
  o: AirsideFitOptions,
  priorRho2: number,
  /** The fan band takes the ram band's exponent. */
  tie: boolean,
): RobustProblem {
  const idx = (p: Param) => free.indexOf(p);
  const bounds: Record<Param, [number, number]> = {
    n_ram: o.exponent_bounds,
    n_fan: o.exponent_bounds,
    rho2: [0, priorRho2 * o.max_ratio_over_prior ** 2],
    flow: o.flow_exponent_bounds,
  };
  const lower = free.map((p) => bounds[p][0]);
  const upper = free.map((p) => bounds[p][1]);
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
      const rho2 = get('rho2');
      const n = [get('n_ram'), tie ? get('n_ram') : get('n_fan')];
      const ref = [
        0.5 * Math.log(rho2 * S_REF.ram + D_REF.ram),
        0.5 * Math.log(rho2 * S_REF.fan + D_REF.fan),
      ];
      // ∂L/∂ρ² of the reference terms (S_ref / (ρ²·S_ref + D_ref)).
      const dRef = [S_REF.ram / (rho2 * S_REF.ram + D_REF.ram), S_REF.fan / (rho2 * S_REF.fan + D_REF.fan)];
      const jn = [idx('n_ram'), tie ? idx('n_ram') : idx('n_fan')];
      const jr = idx('rho2');
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
        if (jr >= 0) J[row + jr] = -0.5 * n[b]! * (D.s[i]! / v2 - dRef[b]!);
        if (jf >= 0) J[row + jf] = -D.logFlow[i]!;
      }
    },
  };
}

/** Pooled within-group standard deviation of ln flow: whether the flow varies enough to fit its term. */
export function spread(D: Data): number {
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
