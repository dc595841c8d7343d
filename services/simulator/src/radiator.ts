import { glycolCp_j_kgk, glycolDensity_kg_m3 } from '@thermargin/core/properties/glycol';
import { type Airside, faceVelocity_ms } from '@thermargin/core/radiator/airside';

/**
 * The simulated radiator. The air side follows the same
 * power law the core refers k with, k ∝ v_face^n (radiator/airside.ts), so a clean radiator at nominal
 * coolant flow has exactly the k the fleet file's design point and bench figures say. On top of that:
 * - fouling (Kern & Seaton 1959) adds a resistance on the frontal-area basis, 1/k = 1/k_clean + R_f, and
 *   cuts face velocity (debris blocks the fins; on finned coils fouling raises the air-side pressure
 *   drop far more than it lowers the heat-transfer coefficient, Bell & Groll 2011, so it acts mostly
 *   through air flow);
 * - the coolant side: with the air taken as a sink at ambient, the coolant stream cools along the core,
 *   ε_c = 1 − e^(−UA/C_c) (the C = 0 case of ε-NTU, Incropera & DeWitt Table 11.3), Q = ε_c·C_c·ITD. UA is
 *   calibrated so that at nominal flow Q = k·A·ITD exactly; less flow (thermostat part-open, pump wear)
 *   then rejects less heat and the radiator temperature drop grows (the coolant-side sign, docs/
 *   operating-bands.md). The coolant
 *   film's own change with flow is neglected (it is the smaller resistance).
 */
export interface RadiatorSpec {
  area_m2: number;
  airside: Airside;
  /** W/(m²·K): clean k at the design point's face velocity, nominal coolant flow. */
  k_design_w_m2k: number;
  /** m/s: face velocity at the design point. */
  v_design_ms: number;
  /** lpm: coolant flow through the radiator with the thermostat fully open and a healthy pump. */
  nominal_flow_lpm: number;
  coolant_glycol_pct: number;
}

/** What faults do to the radiator at one moment (see faults.ts); all 1 / 0 when healthy. */
export interface RadiatorCondition {
  /** m²·K/W on the frontal-area basis. */
  fouling_r_m2k_w: number;
  /** –: face velocity kept despite fin blockage. */
  airflow_factor: number;
  /** –: fan air flow kept (fan faults). */
  fan_factor: number;
}

export const HEALTHY: Readonly<RadiatorCondition> = Object.freeze({
  fouling_r_m2k_w: 0,
  airflow_factor: 1,
  fan_factor: 1,
});

/** m/s: face velocity floor standing still with the fan off (buoyancy and light wind; from memory). */
export const NATURAL_FACE_VELOCITY_MS = 0.3;

/** W/(m²·K): clean k at a face velocity, k_design·(v / v_design)^n. Example: v = v_design → k_design. */
export function cleanK_w_m2k(r: RadiatorSpec, v_face_ms: number): number {
  return r.k_design_w_m2k * (v_face_ms / r.v_design_ms) ** r.airside.velocity_exponent;
}

/** m/s: the air actually crossing the core: fan share reduced by fan faults, all of it by fin blockage. */
export function actualFaceVelocity_ms(
  r: RadiatorSpec,
  speed_kmh: number,
  fan_pct: number,
  c: RadiatorCondition,
): number {
  const v = faceVelocity_ms(speed_kmh, fan_pct * c.fan_factor, r.airside) * c.airflow_factor;
  return Math.max(v, NATURAL_FACE_VELOCITY_MS);
}

/** W/(m²·K): air-side k at nominal coolant flow, with the fouling resistance in series. */
export function airsideK_w_m2k(
  r: RadiatorSpec,
  speed_kmh: number,
  fan_pct: number,
  c: RadiatorCondition,
): number {
  const k = cleanK_w_m2k(r, actualFaceVelocity_ms(r, speed_kmh, fan_pct, c));
  return 1 / (1 / k + c.fouling_r_m2k_w);
}

/** kW/K: ρ·cp·V̇ of the coolant at `t_c` (lpm → m³/s is /60 000; W → kW /1000). */
export function coolantCapacityRate_kw_k(flow_lpm: number, t_c: number, glycol_pct: number): number {
  return (flow_lpm * glycolDensity_kg_m3(t_c, glycol_pct) * glycolCp_j_kgk(t_c, glycol_pct)) / 60_000_000;
}

/** Share of UA/C_nom the nominal flow must keep: kA above it would need more flow than the pump gives. */
const MAX_KA_SHARE = 0.95;

/**
 * kW rejected to the air: ε_c·C_c·ITD with UA calibrated at nominal flow (see top). `ka_kw_k` is the
 * air-side kA at nominal flow, `c_nom_kw_k` and `c_kw_k` the nominal and actual coolant capacity rates.
 * Example: c = c_nom → exactly ka·ITD. Zero flow or ITD ≤ 0 → 0 (a sink cannot heat the loop).
 */
export function heatRejected_kw(ka_kw_k: number, c_nom_kw_k: number, c_kw_k: number, itd_k: number): number {
  if (c_kw_k <= 0 || itd_k <= 0) return 0;
  const ua = -c_nom_kw_k * Math.log1p(-Math.min(ka_kw_k / c_nom_kw_k, MAX_KA_SHARE));
  return -Math.expm1(-ua / c_kw_k) * c_kw_k * itd_k;
}
