import { requiredArea_m2, supportedAmbient_c, supportedHeat_kw } from '../radiator/rating.ts';

/**
 * The sizing calculator on the rating formula (common practice; docs/methods.md §3):
 *   A_req = Q_design / (k_field · (T_limit − T_amb,design)) · (1 + fouling allowance),
 * and its inverses for a given net area, with the fouled k = k_field / (1 + allowance) so the three
 * answers agree. Formulas live in radiator/rating.ts; this puts them together for one design question.
 */
export interface DesignQuestion {
  /** °C: design (hottest-day) ambient. */
  ambient_c: number;
  /** kW: design heat into the coolant. */
  heat_kw: number;
  /** °C: coolant limit. */
  coolant_limit_c: number;
  /** W/(m²·K): field k at the design air condition, clean core. */
  k_w_m2k: number;
  /** –: fouling allowance, e.g. 0.15 for 15 % extra area. */
  fouling_allowance: number;
  /** m²: a net area to test (the installed one); when absent only the required area is given. */
  area_m2?: number;
}

export interface DesignAnswer {
  itd_k: number;
  /** W/(m²·K): k of the fouled core the design is made for, k / (1 + allowance). */
  k_fouled_w_m2k: number;
  required_area_m2: number;
  /** For `area_m2`: the design heat it carries at the design ambient, and the hottest ambient it carries the design heat at. */
  area_m2: number | null;
  supported_heat_kw: number | null;
  supported_ambient_c: number | null;
  /** %: margin of `area_m2` at the design point with the fouled k. */
  margin_pct: number | null;
}

/**
 * Answers one design question. Example (common practice): 40 °C, 20 kW, 120 °C, k 1000, no allowance →
 * ITD 80 K, 0.25 m²; the same 0.25 m² at an 80 °C limit supports 10 kW (half the ITD, half the heat).
 */
export function answerDesign(q: DesignQuestion): DesignAnswer {
  const required = requiredArea_m2(q.heat_kw, q.k_w_m2k, q.coolant_limit_c, q.ambient_c, q.fouling_allowance);
  const kFouled = q.k_w_m2k / (1 + q.fouling_allowance);
  const a = q.area_m2 ?? null;
  const heat = a === null ? null : supportedHeat_kw(kFouled, a, q.coolant_limit_c, q.ambient_c);
  return {
    itd_k: q.coolant_limit_c - q.ambient_c,
    k_fouled_w_m2k: kFouled,
    required_area_m2: required,
    area_m2: a,
    supported_heat_kw: heat,
    supported_ambient_c: a === null ? null : supportedAmbient_c(kFouled, a, q.coolant_limit_c, q.heat_kw),
    margin_pct: heat === null ? null : 100 * (heat / q.heat_kw - 1),
  };
}
