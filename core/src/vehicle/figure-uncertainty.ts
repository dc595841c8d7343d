import type { BandWindowsEvidence, FittedFigure } from '@thermargin/shared';
import { type Airside, FAN_REFERENCE, faceVelocity_ms, RAM_REFERENCE } from '../radiator/airside.ts';
import type { AirsideFigures } from '../radiator/airside-fit.ts';
import type { Band } from '../trip/bands.ts';
import type { Referral } from '../trip/refer.ts';
import type { UnmeasuredHeat } from '../trip/unmeasured-heat.ts';

/**
 * How far off each figure a trip's k is referred with may be (95 %), beside its value: a fitted figure
 * by its interval, one from the fleet file not at all (given, as aux_heat_kw is), a default by the
 * range it stands for (airside.ts: exponent 0.4–0.8, common practice; face velocity 3–8 m/s at highway
 * speed and 1.5–4 m/s from the fan, from memory).
 */
export interface FigureUncertainty {
  /** –: 95 % half-width of each band's exponent. */
  exponent_half95: Record<Band, number>;
  /** Lowest and highest plausible ρ² = (ram_face_ratio / fan_face_velocity)². */
  rho2_range: [number, number];
  /** kW: lowest and highest plausible unmeasured heat; null when the data cannot bound it. */
  aux_range_kw: [number, number] | null;
  /** K: 95 % half-width of the ambient correction applied (per sensor period: learn.ts sets it per trip). */
  ambient_half95_k: number;
}

/** The defaults' ranges (airside.ts). */
const DEFAULT_RANGE = {
  exponent_half95: 0.2,
  /** Face velocity per road speed at highway speed (≈ 80 km/h): 3–8 m/s. */
  ram_face_ratio: [3 / (80 / 3.6), 8 / (80 / 3.6)] as [number, number],
  fan_face_velocity_ms: [1.5, 4] as [number, number],
};

const half = (f: FittedFigure) => (f.ci95 ? (f.ci95[1] - f.ci95[0]) / 2 : 0);

/** The uncertainty of what the vehicle stage learned or assumed (learn.ts), figure by figure; no ambient correction. */
export function figureUncertainty(f: AirsideFigures, unmeasured: UnmeasuredHeat): FigureUncertainty {
  const exponent = (x: FittedFigure) =>
    x.basis === 'fitted' ? half(x) : x.basis === 'default' ? DEFAULT_RANGE.exponent_half95 : 0;
  // Unless fitted apart (a borrowed figure is reported as a copy of the ram band's), the fan band's
  // exponent may not be the ram band's: the default range stands, or nothing when the fleet file gives it.
  const fan = f.fan_velocity_exponent;
  const ram = f.velocity_exponent;
  const fanOwn =
    fan.basis === 'fitted' &&
    fan.ci95 !== null &&
    (fan.value !== ram.value || fan.ci95[0] !== ram.ci95?.[0] || fan.ci95[1] !== ram.ci95?.[1]);
  const vf = f.fan_face_velocity_ms.value;
  const ratio = f.ram_face_ratio;
  const rho2 = (r: number, v: number) => (r / v) ** 2;
  const rho2_range: [number, number] =
    ratio.basis === 'fitted' && ratio.ci95
      ? [rho2(Math.max(0, ratio.ci95[0]), vf), rho2(ratio.ci95[1], vf)]
      : ratio.basis === 'default'
        ? [
            rho2(DEFAULT_RANGE.ram_face_ratio[0], DEFAULT_RANGE.fan_face_velocity_ms[1]),
            rho2(DEFAULT_RANGE.ram_face_ratio[1], DEFAULT_RANGE.fan_face_velocity_ms[0]),
          ]
        : [rho2(ratio.value, vf), rho2(ratio.value, vf)];
  const aux_range_kw: [number, number] | null =
    unmeasured.basis === 'fleet_file'
      ? [unmeasured.value_kw, unmeasured.value_kw]
      : unmeasured.ci95
        ? [Math.max(0, unmeasured.ci95[0]), Math.max(0, unmeasured.ci95[1])]
        : null;
  return {
    exponent_half95: {
      ram: exponent(ram),
      fan: fanOwn ? half(fan) : ram.basis === 'fleet_file' ? 0 : DEFAULT_RANGE.exponent_half95,
    },
    rho2_range,
    aux_range_kw,
    ambient_half95_k: 0,
  };
}

/**
 * 95 % half-width in ln k of a band k from its windows: how far the figures' plausible values move
 * the mean of the windows' ln k_ref = ln Q − ln(ITD − correction) − n·L(ρ²), L = ½·ln((ρ²·S + D) /
 * (ρ²·S_ref + D_ref)) as in airside-window-model.ts; each figure's shift taken at its worse end, the
 * figures' shifts added in quadrature (independent). Only the windows that gave a k count
 * (`k_w_m2k`, refer.ts's per window); those with a flow meter do not carry the unmeasured heat.
 * Example: one fan window at 0 km/h and full fan, only the exponent uncertain → 0.
 */
export function figureHalfWidth(
  band: Band,
  e: BandWindowsEvidence,
  k_w_m2k: ArrayLike<number>,
  r: Referral,
  u: FigureUncertainty,
): number {
  const a = r.airside;
  const n = band === 'fan' ? (a.fan_velocity_exponent ?? a.velocity_exponent) : a.velocity_exponent;
  const ref = band === 'fan' ? FAN_REFERENCE : RAM_REFERENCE;
  /** The air side with ρ² = p: the ram ratio moved, the fan's face velocity kept. */
  const withRho2 = (p: number): Airside => ({ ...a, ram_face_ratio: Math.sqrt(p) * a.fan_face_velocity_ms });
  /** ln of a window's face velocity over the reference's (airside.ts). */
  const L = (i: number, air: Airside) =>
    Math.log(
      faceVelocity_ms(e.speed_kmh[i]!, e.fan_pct[i]!, air) / faceVelocity_ms(ref.speed_kmh, ref.fan_pct, air),
    );
  const at: number[] = [];
  for (let i = 0; i < e.itd_k.length; i++) if (Number.isFinite(k_w_m2k[i])) at.push(i);
  const m = at.length;
  let dN = 0;
  const dRho = [0, 0];
  const dAux = [0, 0];
  let dAmb = 0;
  for (const i of at) {
    const l = L(i, a);
    dN += l;
    // In the ram band ρ cancels but for the little fan duty there; the fit's level takes that.
    if (band === 'fan')
      u.rho2_range.forEach((p, j) => {
        dRho[j]! += n * (L(i, withRho2(p)) - l);
      });
    dAmb += 1 / (e.itd_k[i]! - r.ambient_correction_k);
    const bal = e.meter_kw[i] === null ? e.balance_kw[i] : null;
    if (bal === null || bal === undefined || u.aux_range_kw === null) continue;
    const q = bal + r.unmeasured_heat_kw;
    // A heat that would leave the window with none gives it no k: as far as it can go, a tenth.
    u.aux_range_kw.forEach((aux, j) => {
      dAux[j]! += Math.log(Math.max(bal + aux, 0.1 * q) / q);
    });
  }
  if (m === 0) return 0;
  const worse = (x: number[]) => Math.max(...x.map((s) => Math.abs(s / m)));
  const parts = [
    (u.exponent_half95[band] * dN) / m,
    worse(dRho),
    worse(dAux),
    (u.ambient_half95_k * dAmb) / m,
  ];
  return Math.sqrt(parts.reduce((s, x) => s + x * x, 0));
}

/**
 * The interval of a band k widened by the figures' half-width h (ln k): each side's distance from k in
 * ln k added in quadrature to h. Example: k 2000, [1960, 2040], h 0.02 → [1943.9, 2057.1].
 */
export function widened(k: number, ci: [number, number], h: number): [number, number] {
  const lo = Math.sqrt(Math.log(k / ci[0]) ** 2 + h * h);
  const hi = Math.sqrt(Math.log(ci[1] / k) ** 2 + h * h);
  return [k * Math.exp(-lo), k * Math.exp(hi)];
}
