/**
 * Validity rules of the k estimator: which samples say something about the radiator, and how they are
 * averaged. Defaults defined once here; each says why.
 */
export const ESTIMATOR_DEFAULTS = {
  /** s, 60: averaging window. Long enough that the storage slope C·dT/dt is measured well under
   *  0.1–0.3 K sensor noise (σ_slope ≈ σ·√12 / T^1.5 ≈ 0.004 K/s at 0.2 K), short enough to stay in one band. */
  window_s: 60,
  /** s, 10: the blocks at each end of a window whose mean temperatures give its mean dT/dt (a sixth
   *  of the window: at 0.2 K sensor noise and 1 Hz the slope's error is ≈ 0.2·√(2/10)/50 ≈ 0.002 K/s). */
  storage_edge_s: 10,
  /** s, 30: a window cut short by leaving the band is kept if at least this long. */
  min_window_s: 30,
  /** s, 10: a larger gap between samples ends a window; the estimator never averages across a gap. */
  max_step_s: 10,
  /** K, 0.5: once the coolant has read full-open, samples count until one reads this far below it:
   *  about twice the coolant sensor's noise (0.1–0.3 K), so noise alone does not cut windows. */
  full_open_hysteresis_k: 0.5,
  /** K, 10: minimum ITD, so a 0.5 K sensor error stays within 5 % of k. */
  min_itd_k: 10,
  /** –, 0.05: minimum heat rejected as a share of the design heat load (and at least min_heat_kw);
   *  below it the radiator is barely working and k is dominated by errors of the heat estimate. */
  min_heat_share_of_design: 0.05,
  /** kW, 2: absolute floor of the heat rejected in a window. */
  min_heat_kw: 2,
  /** –, 0.5: near-steady rule without a flow meter: |C·dT/dt| at most this share of the heat generated,
   *  so an error in the thermal mass C cannot dominate the heat rejected. */
  max_storage_share: 0.5,
  /** –, 1: windows needed for a band estimate. Each window is a whole energy balance, so one gives a
   *  k (every trip with a few minutes in a band gets one); the order-statistic 95 % interval of the
   *  median needs 6, and below that the vehicle stage gives the interval from its window scatter. */
  min_windows: 1,
} as const;

export type EstimatorOptions = { -readonly [K in keyof typeof ESTIMATOR_DEFAULTS]: number };
