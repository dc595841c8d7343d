/**
 * The simplified radiator rating formula Q = k · A_net · ITD (common practice; docs/methods.md §3) and
 * the figures derived from it: cooling margin, limiting ambient temperature (LAT, the term of SAE J1393), and the sizing
 * inverses. k in W/(m²·K) of net frontal area, kA in W/K, heat in kW: the ×1000 lives here only.
 */

function positive(fn: string, name: string, value: number): void {
  if (!(value > 0 && value < Number.POSITIVE_INFINITY)) {
    throw new RangeError(`${fn}: ${name} must be finite and > 0, got ${value}`);
  }
}

function finite(fn: string, name: string, value: number): void {
  if (!Number.isFinite(value)) throw new RangeError(`${fn}: ${name} must be finite, got ${value}`);
}

/** ITD of a design point; throws when the limit is not above the ambient (no radiator can cool then). */
function designItd_k(fn: string, coolant_limit_c: number, ambient_c: number): number {
  finite(fn, 'coolant_limit_c', coolant_limit_c);
  finite(fn, 'ambient_c', ambient_c);
  const itd = coolant_limit_c - ambient_c;
  if (!(itd > 0)) {
    throw new RangeError(
      `${fn}: coolant_limit_c (${coolant_limit_c} °C) must be above ambient_c (${ambient_c} °C)`,
    );
  }
  return itd;
}

/**
 * K: initial temperature difference, coolant temperature at the radiator inlet minus ambient air
 * (trade term). Example: 95 °C in, 30 °C ambient → 65 K.
 */
export function itd_k(coolant_in_c: number, ambient_c: number): number {
  finite('itd_k', 'coolant_in_c', coolant_in_c);
  finite('itd_k', 'ambient_c', ambient_c);
  return coolant_in_c - ambient_c;
}

/**
 * kW rejected by a radiator of `area_m2` net frontal area at k and ITD: Q = k · A · ITD / 1000.
 * Example: k 1000 W/(m²·K), 0.5 m², 65 K → 32.5 kW.
 */
export function ratedHeat_kw(k_w_m2k: number, area_m2: number, itd_k: number): number {
  positive('ratedHeat_kw', 'k_w_m2k', k_w_m2k);
  positive('ratedHeat_kw', 'area_m2', area_m2);
  finite('ratedHeat_kw', 'itd_k', itd_k);
  return (k_w_m2k * area_m2 * itd_k) / 1000;
}

/**
 * % cooling margin at a design point: 100 · (kA · (T_limit − T_amb) / Q − 1); 12.5 means the radiator
 * could reject 12.5 % more than the design heat at the design ambient, negative means it falls short.
 * Example: kA 450 W/K, limit 105 °C, ambient 45 °C, 24 kW → +12.5 %.
 */
export function marginPct(
  ka_w_k: number,
  coolant_limit_c: number,
  ambient_c: number,
  heat_kw: number,
): number {
  positive('marginPct', 'ka_w_k', ka_w_k);
  positive('marginPct', 'heat_kw', heat_kw);
  finite('marginPct', 'coolant_limit_c', coolant_limit_c);
  finite('marginPct', 'ambient_c', ambient_c);
  return 100 * ((ka_w_k * (coolant_limit_c - ambient_c)) / (1000 * heat_kw) - 1);
}

/**
 * °C: limiting ambient temperature, the hottest ambient at which the design heat is still rejected
 * without passing the limit: T_limit − Q / kA (LAT as SAE J1393 names it).
 * Example: kA 450 W/K, limit 105 °C, 24 kW → 51.67 °C.
 */
export function limitingAmbient_c(ka_w_k: number, coolant_limit_c: number, heat_kw: number): number {
  positive('limitingAmbient_c', 'ka_w_k', ka_w_k);
  finite('limitingAmbient_c', 'coolant_limit_c', coolant_limit_c);
  if (!(heat_kw >= 0 && heat_kw < Number.POSITIVE_INFINITY)) {
    throw new RangeError(`limitingAmbient_c: heat_kw must be finite and ≥ 0, got ${heat_kw}`);
  }
  return coolant_limit_c - (1000 * heat_kw) / ka_w_k;
}

/**
 * m² of net frontal area needed to reject `heat_kw` at the design ambient without passing the limit:
 * Q / (k · (T_limit − T_amb)) · (1 + fouling_allowance). Throws when the limit is not
 * above the ambient. Example: 24 kW, k 800 W/(m²·K), limit 105 °C, ambient 45 °C, allowance 0.1 → 0.55 m².
 */
export function requiredArea_m2(
  heat_kw: number,
  k_w_m2k: number,
  coolant_limit_c: number,
  ambient_c: number,
  fouling_allowance = 0,
): number {
  positive('requiredArea_m2', 'heat_kw', heat_kw);
  positive('requiredArea_m2', 'k_w_m2k', k_w_m2k);
  if (!(fouling_allowance >= 0 && fouling_allowance < Number.POSITIVE_INFINITY)) {
    throw new RangeError(
      `requiredArea_m2: fouling_allowance must be finite and ≥ 0, got ${fouling_allowance}`,
    );
  }
  const itd = designItd_k('requiredArea_m2', coolant_limit_c, ambient_c);
  return ((1000 * heat_kw) / (k_w_m2k * itd)) * (1 + fouling_allowance);
}

/**
 * kW the radiator can reject at the limit on a day at `ambient_c`: k · A · (T_limit − T_amb) / 1000.
 * Throws when the limit is not above the ambient. Example: k 800, 0.5 m², limit 105 °C, 45 °C → 24 kW.
 */
export function supportedHeat_kw(
  k_w_m2k: number,
  area_m2: number,
  coolant_limit_c: number,
  ambient_c: number,
): number {
  positive('supportedHeat_kw', 'k_w_m2k', k_w_m2k);
  positive('supportedHeat_kw', 'area_m2', area_m2);
  return ratedHeat_kw(k_w_m2k, area_m2, designItd_k('supportedHeat_kw', coolant_limit_c, ambient_c));
}

/**
 * °C: hottest ambient at which a radiator of k and area still rejects `heat_kw` at the limit; the LAT
 * with kA = k · A. Example: k 800, 0.5 m², limit 105 °C, 24 kW → 45 °C.
 */
export function supportedAmbient_c(
  k_w_m2k: number,
  area_m2: number,
  coolant_limit_c: number,
  heat_kw: number,
): number {
  positive('supportedAmbient_c', 'k_w_m2k', k_w_m2k);
  positive('supportedAmbient_c', 'area_m2', area_m2);
  return limitingAmbient_c(k_w_m2k * area_m2, coolant_limit_c, heat_kw);
}
