import { rejectionPerItd_w_k } from './crossflow.ts';
import { AIR_CP_J_KGK, airDensity_kg_m3, coolantRhoCp_j_m3k } from './fluids.ts';

/**
 * A tube-and-fin radiator core, all conductances per m² of frontal area so cores of any size share
 * the same shape. k(v) comes out of ε-NTU, not a power law:
 * - air side: h ∝ v^m (louvred-fin j-factors of Davenport 1983 and Chang & Wang 1997 give
 *   m ≈ 0.5–0.6, from memory), with the fin
 *   efficiency tanh(mL)/mL falling as h rises (mL ∝ √h) and an overall surface efficiency
 *   η_o = 1 − s·(1 − η_f), s the fin share of the air-side area (textbook fin theory);
 * - coolant side: h ∝ V̇^0.8 (turbulent Dittus–Boelter);
 * - fouling: an air-side deposit resistance plus lost face velocity (both: on finned coils dust raises
 *   the pressure drop more than it lowers h, Bell & Groll 2011).
 */
export interface RadiatorCore {
  area_m2: number;
  /** m/s: face velocity at which the air-side figures below are given. */
  air_ref_velocity_ms: number;
  /** W/(m²·K) of frontal area: η_o·h·A_air / A_front at the reference velocity. */
  air_conductance_ref_w_m2k: number;
  /** –: m in h ∝ v^m. */
  air_h_exponent: number;
  /** –: fin parameter m·L at the reference velocity. */
  fin_ml_ref: number;
  /** –: fin share of the air-side area. */
  fin_area_share: number;
  /** W/(m²·K) of frontal area: coolant-side h·A_c / A_front at the reference flow. */
  coolant_conductance_ref_w_m2k: number;
  /** L/min: reference coolant flow of the figure above. */
  coolant_ref_lpm: number;
}

export interface Fouling {
  /** m²·K/W per m² of frontal area: deposit resistance on the air side. */
  air_resistance_m2k_w: number;
  /** –: share of the face velocity lost to blocked fin passages. */
  air_blockage: number;
}

export const CLEAN: Readonly<Fouling> = Object.freeze({ air_resistance_m2k_w: 0, air_blockage: 0 });

function surfaceEfficiency(core: RadiatorCore, hRatio: number): number {
  const ml = core.fin_ml_ref * Math.sqrt(hRatio);
  return 1 - core.fin_area_share * (1 - Math.tanh(ml) / ml);
}

/** W/(m²·K) of frontal area: UA/A of the core at a face velocity and coolant flow. */
export function uaPerArea_w_m2k(core: RadiatorCore, v_ms: number, flow_lpm: number, f: Fouling): number {
  const hRatio = (v_ms / core.air_ref_velocity_ms) ** core.air_h_exponent;
  const air =
    (core.air_conductance_ref_w_m2k * hRatio * surfaceEfficiency(core, hRatio)) / surfaceEfficiency(core, 1);
  const coolant = core.coolant_conductance_ref_w_m2k * (flow_lpm / core.coolant_ref_lpm) ** 0.8;
  return 1 / (1 / air + f.air_resistance_m2k_w + 1 / coolant);
}

/** Operating point of the core: what the air and the coolant bring to it. */
export interface CorePoint {
  /** m/s: face velocity of a clean core (fouling blockage is applied here). */
  face_velocity_ms: number;
  /** L/min through the core. */
  flow_lpm: number;
  ambient_c: number;
  coolant_in_c: number;
}

/**
 * W/(m²·K): the core's true k = Q / (A · ITD) at an operating point (ε·C_min / A). Zero without flow
 * on either side. With ITD > 0 the heat rejected is k · A · ITD.
 */
export function coreK_w_m2k(core: RadiatorCore, p: CorePoint, f: Fouling): number {
  const v = p.face_velocity_ms * (1 - f.air_blockage);
  if (v <= 0 || p.flow_lpm <= 0) return 0;
  const cAir = airDensity_kg_m3(p.ambient_c) * AIR_CP_J_KGK * v * core.area_m2;
  const cCoolant = (coolantRhoCp_j_m3k(p.coolant_in_c) * p.flow_lpm) / 60_000;
  const ua = uaPerArea_w_m2k(core, v, p.flow_lpm, f) * core.area_m2;
  return rejectionPerItd_w_k(ua, cAir, cCoolant) / core.area_m2;
}

/**
 * –: power-law exponent n of k ∝ v^n fitted the way an engineer fits bench data: least squares of
 * ln k on ln v over a sweep of face velocities (geometric spacing), at one coolant flow and ambient.
 */
export function fitVelocityExponent(
  core: RadiatorCore,
  sweep: { from_ms: number; to_ms: number; flow_lpm: number; ambient_c: number; coolant_in_c: number },
): number {
  const pts = 13;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < pts; i++) {
    const v = sweep.from_ms * (sweep.to_ms / sweep.from_ms) ** (i / (pts - 1));
    xs.push(Math.log(v));
    ys.push(Math.log(coreK_w_m2k(core, { ...sweep, face_velocity_ms: v }, CLEAN)));
  }
  const mx = xs.reduce((s, x) => s + x, 0) / pts;
  const my = ys.reduce((s, y) => s + y, 0) / pts;
  let sxy = 0;
  let sxx = 0;
  xs.forEach((x, i) => {
    sxy += (x - mx) * (ys[i]! - my);
    sxx += (x - mx) ** 2;
  });
  return sxy / sxx;
}
