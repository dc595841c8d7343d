/**
 * Ethylene-glycol/water coolant properties: density, specific heat and freezing point as functions of
 * temperature and glycol concentration.
 *
 * Source: Å. Melinder, *Properties of Secondary Working Fluids for Indirect Systems*, 2nd ed., IIR 2010,
 * polynomial P(x, t) = Σ c_ij · (100·x − 30.8462)^i · (t − 31.728)^j (x mass fraction, t °C), with the
 * coefficients as implemented in NREL SecondaryCoolantProps (`scp/ethylene_glycol.py`). It is a fit:
 * at x = 0 it gives 997.35 kg/m³ at 20 °C against 998.21 for real water (IAPWS-95).
 *
 * Validity and what happens outside it:
 * - Concentration: the fit covers mass fraction 0–0.60. Up to 0.63 is accepted as a mild extrapolation
 *   so that 60 vol % mixes (0.626) work; anything else throws a RangeError.
 * - Temperature: the fit covers the mixture's freezing point up to 100 °C. Temperatures outside are
 *   clamped to that range (as the reference implementation does), because a polynomial diverges
 *   quickly beyond its data and a frozen or boiling loop has no single-phase properties anyway.
 */

/** Mass fraction, –: highest concentration the fit covers (Melinder 2010). */
export const GLYCOL_FIT_MAX_MASS_FRACTION = 0.6;
/** Mass fraction, –: highest concentration accepted (mild extrapolation, covers 60 vol % = 0.626). */
export const GLYCOL_MAX_MASS_FRACTION = 0.63;
/** °C: top of the fit's temperature range; hotter inputs are clamped to it. */
export const GLYCOL_MAX_T_C = 100;

/** kg/m³ at 20 °C, the mixing temperature of the volume basis: ethylene glycol and water. */
const RHO_EG_20C_KG_M3 = 1113.5;
const RHO_WATER_20C_KG_M3 = 998.2;

const X_BASE_PCT = 30.8462;
const T_BASE_C = 31.728;

/** c[i][j]: coefficient of (100·x − X_BASE)^i · (t − T_BASE)^j. */
type Coefficients = readonly (readonly number[])[];

const DENSITY_KG_M3: Coefficients = [
  [1.034e3, -4.781e-1, -2.692e-3, 4.725e-6],
  [1.311, -6.876e-3, 4.805e-5, 1.69e-8],
  [7.49e-5, 7.855e-5, -3.995e-7, 4.982e-9],
  [-1.062e-4, 1.229e-6, -1.153e-8],
  [-9.623e-7, -7.211e-8],
  [4.891e-8],
];

const CP_J_KGK: Coefficients = [
  [3.737e3, 2.93, -4.675e-3, -1.389e-5],
  [-1.799e1, 1.046e-1, -4.147e-4, 1.847e-7],
  [-9.933e-2, 3.516e-4, 5.109e-6, -7.138e-8],
  [2.61e-3, -1.189e-6, -1.643e-7],
  [1.537e-5, -4.272e-7],
  [-1.618e-6],
];

const FREEZING_C: Coefficients = [
  [-1.525e1, -1.566e-6, -2.278e-7, 2.169e-9],
  [-8.08e-1, -1.339e-6, 2.047e-8, -2.717e-11],
  [-1.334e-2, 6.322e-8, 2.373e-10, -2.183e-12],
  [-7.293e-5, 1.764e-9, -2.442e-11],
  [1.006e-6, -7.662e-11],
  [1.14e-9],
];

function melinder(c: Coefficients, mass_fraction: number, t_c: number): number {
  const dx = 100 * mass_fraction - X_BASE_PCT;
  const dt = t_c - T_BASE_C;
  let sum = 0;
  let xi = 1;
  for (const row of c) {
    let tj = 1;
    for (const coeff of row) {
      sum += coeff * xi * tj;
      tj *= dt;
    }
    xi *= dx;
  }
  return sum;
}

function checkMassFraction(fn: string, mass_fraction: number): void {
  if (!(mass_fraction >= 0 && mass_fraction <= GLYCOL_MAX_MASS_FRACTION)) {
    throw new RangeError(
      `${fn}: glycol mass fraction must be within 0…${GLYCOL_MAX_MASS_FRACTION}, got ${mass_fraction}`,
    );
  }
}

function massFromVolume(fn: string, vol_pct: number): number {
  if (!(vol_pct >= 0 && vol_pct <= 100)) {
    throw new RangeError(`${fn}: glycol volume % must be within 0…100, got ${vol_pct}`);
  }
  const eg = vol_pct * RHO_EG_20C_KG_M3;
  return eg / (eg + (100 - vol_pct) * RHO_WATER_20C_KG_M3);
}

/** A property at `t_c` °C, the temperature clamped to the fit's range [freezing point, 100 °C]. */
function property(fn: string, c: Coefficients, t_c: number, mass_fraction: number): number {
  checkMassFraction(fn, mass_fraction);
  if (Number.isNaN(t_c)) throw new RangeError(`${fn}: temperature is NaN`);
  const t = Math.min(GLYCOL_MAX_T_C, Math.max(freezePoint_c(mass_fraction), t_c));
  return melinder(c, mass_fraction, t);
}

/** As `property`, for a concentration in volume %; the error names the volume the caller gave. */
function volumeProperty(fn: string, c: Coefficients, t_c: number, vol_pct: number): number {
  const x = massFromVolume(fn, vol_pct);
  if (x > GLYCOL_MAX_MASS_FRACTION) {
    throw new RangeError(
      `${fn}: ${vol_pct} vol % glycol is mass fraction ${x.toFixed(3)}, above the accepted ${GLYCOL_MAX_MASS_FRACTION}`,
    );
  }
  return property(fn, c, t_c, x);
}

function freezePoint_c(mass_fraction: number): number {
  return Math.min(0, melinder(FREEZING_C, mass_fraction, T_BASE_C));
}

/**
 * Mass fraction, –, of a mix given in volume % of glycol, the volumes measured at 20 °C
 * (ρ_EG 1113.5, ρ_water 998.2 kg/m³; volume contraction on mixing ignored, as in trade tables).
 * Throws RangeError outside 0…100 %. Example: 50 vol % → 0.5273.
 */
export function glycolMassFraction(vol_pct: number): number {
  return massFromVolume('glycolMassFraction', vol_pct);
}

/**
 * °C: freezing point (first ice crystals) at a glycol mass fraction (Melinder 2010 polynomial, taken at
 * its reference temperature: the fit's temperature terms move it by < 0.002 K). Never above 0 °C.
 * Throws RangeError for a mass fraction outside 0…0.63. Example: 0.40 → −23.81 °C.
 */
export function glycolFreezePoint_c(mass_fraction: number): number {
  checkMassFraction('glycolFreezePoint_c', mass_fraction);
  return freezePoint_c(mass_fraction);
}

/**
 * kg/m³: density at `t_c` °C and a glycol mass fraction (Melinder 2010; temperature clamped to the fit's
 * range, RangeError for a mass fraction outside 0…0.63). Example: (20 °C, 0.40) → 1051.9 kg/m³.
 */
export function glycolDensityByMass_kg_m3(t_c: number, mass_fraction: number): number {
  return property('glycolDensityByMass_kg_m3', DENSITY_KG_M3, t_c, mass_fraction);
}

/**
 * J/(kg·K): specific heat at `t_c` °C and a glycol mass fraction (Melinder 2010; temperature clamped to
 * the fit's range, RangeError for a mass fraction outside 0…0.63). Example: (20 °C, 0.40) → 3519 J/(kg·K).
 */
export function glycolCpByMass_j_kgk(t_c: number, mass_fraction: number): number {
  return property('glycolCpByMass_j_kgk', CP_J_KGK, t_c, mass_fraction);
}

/**
 * kg/m³: density at `t_c` °C of a mix given in volume % glycol (converted by `glycolMassFraction`,
 * then Melinder 2010). RangeError above ≈ 60.4 vol % (mass fraction 0.63). Example: (80 °C, 50 %) → 1029.2.
 */
export function glycolDensity_kg_m3(t_c: number, glycol_vol_pct: number): number {
  return volumeProperty('glycolDensity_kg_m3', DENSITY_KG_M3, t_c, glycol_vol_pct);
}

/**
 * J/(kg·K): specific heat at `t_c` °C of a mix given in volume % glycol (converted by
 * `glycolMassFraction`, then Melinder 2010). RangeError above ≈ 60.4 vol %. Example: (80 °C, 50 %) → 3538.
 */
export function glycolCp_j_kgk(t_c: number, glycol_vol_pct: number): number {
  return volumeProperty('glycolCp_j_kgk', CP_J_KGK, t_c, glycol_vol_pct);
}
