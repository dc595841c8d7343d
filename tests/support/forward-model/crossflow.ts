/**
 * ε-NTU of a crossflow radiator core with the coolant mixed across each flat tube and the air unmixed
 * between fins (the usual idealisation of a tube-and-fin radiator). Closed forms as in Incropera &
 * DeWitt, Table 11.3 (table number from memory; values in docs/methods.md §3): an independent
 * implementation for the test model, not the core's.
 */

/** –: ε for the mixed fluid being C_max (air is C_min). Example: NTU 1, C 0.5 → 0.5420. */
export function epsilonCmaxMixed(ntu: number, c_ratio: number): number {
  if (c_ratio < 1e-9) return 1 - Math.exp(-ntu);
  return (1 - Math.exp(-c_ratio * (1 - Math.exp(-ntu)))) / c_ratio;
}

/** –: ε for the mixed fluid being C_min (coolant is C_min). Example: NTU 1, C 0.5 → 0.5448. */
export function epsilonCminMixed(ntu: number, c_ratio: number): number {
  if (c_ratio < 1e-9) return 1 - Math.exp(-ntu);
  return 1 - Math.exp(-(1 - Math.exp(-c_ratio * ntu)) / c_ratio);
}

/**
 * W/K: heat rate per kelvin of ITD, ε·C_min, for capacity rates of air and coolant (W/K) and the
 * core's UA (W/K). The coolant is the mixed stream.
 */
export function rejectionPerItd_w_k(ua_w_k: number, cAir_w_k: number, cCoolant_w_k: number): number {
  if (cAir_w_k <= 0 || cCoolant_w_k <= 0) return 0;
  const cMin = Math.min(cAir_w_k, cCoolant_w_k);
  const ratio = cMin / Math.max(cAir_w_k, cCoolant_w_k);
  const ntu = ua_w_k / cMin;
  const eps = cAir_w_k <= cCoolant_w_k ? epsilonCmaxMixed(ntu, ratio) : epsilonCminMixed(ntu, ratio);
  return eps * cMin;
}
