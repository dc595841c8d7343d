/**
 * Method parameters of the health assessment (the inspection thresholds are in the fleet file's
 * `policy`, shared/src/policy.ts). Unit and default first in each comment.
 */
export interface HealthOptions {
  /**
   * trips, 10: valid trips whose median k is a band's baseline when the fleet file gives no bench k,
   * and whose median health is the change detectors' reference. A median of 10 has a standard error
   * near 0.4 σ (≈ 1.5 % at 4 % trip noise), and 10 trips are days, not weeks, of service.
   */
  baseline_trips: number;
  /**
   * trips, 25: the detectors' reference keeps learning from in-control trips up to this many, until the
   * first signal (a self-starting chart, after Hawkins 1987): a reference from only the first 10 trips
   * is off by about 0.4 σ, enough to cut an EWMA's in-control run length several-fold.
   */
  reference_trips: number;
  /**
   * –, 0.1: EWMA weight λ. With L 2.814 the two-sided chart has in-control ARL ≈ 500 (Lucas &
   * Saccucci 1990); only the lower limit is used, so false alarms on a healthy vehicle are rarer still.
   */
  ewma_lambda: number;
  /** σ, 2.814: EWMA limit width L (pairs with λ 0.1). */
  ewma_L: number;
  /** σ, 0.5: CUSUM reference value k, tuned to a 1 σ shift (Montgomery's usual design). */
  cusum_k: number;
  /** σ, 5: CUSUM decision interval h: one-sided in-control ARL 930.9 trips. */
  cusum_h: number;
  /**
   * σ, 1.5 and 3: the step chart, a CUSUM that watches the segment after a change for a further sudden
   * fall (a fan failing on a fouled core), while the main charts stay out of control. Tuned to large
   * steps: by Siegmund's approximation its in-control ARL is ≈ 6·10⁴ trips; by Monte Carlo a 2 σ step
   * takes ≈ 6.4 trips and a 4 σ one ≈ 1.8 (tests/core/stats). Its reference is the segment's current
   * level (a line while the segment falls significantly), so the drift of a fouling core is no step.
   */
  step_k: number;
  step_h: number;
  /**
   * trips, 5: the charts must stay in control this long after a signal before the next one counts as a
   * new change; a shorter lapse continues the last change.
   */
  rearm_trips: number;
  /** health units, 0.01: floor on the trip noise σ, so a quiet start does not make the charts twitchy. */
  sigma_floor: number;
  /** trips, 30: most recent trips the current level (Theil–Sen) is estimated from. */
  level_window_trips: number;
  /** trips, 3: fewer trips since a re-baseline or a change point leave the level not judged. */
  min_level_trips: number;
  /** K, 2.5: a key-on soak offset beyond this is implausible (the trade's check: within a couple of K). */
  soak_tolerance_k: number;
  /** cold starts, 5: soak checks looked back over. */
  soak_window: number;
  /** cold starts, 3: offsets beyond tolerance, all of one sign, within the window that make the sensors suspect. */
  soak_min_hits: number;
  /** trips, 10: recent trips whose sensor flags are counted. */
  sensor_flag_window: number;
  /** –, 0.3: share of those trips with flags that makes the sensors suspect. */
  sensor_flag_share: number;
  /** –, 0.15: relative rise of the radiator ΔT per kW (recent median vs baseline) that points at coolant flow. */
  coolant_dt_rise: number;
  /** –, 0.05: rise of the median fan-saturated share that supports a fan fault. */
  fan_saturation_rise: number;
  /** –, 0.5: lowest score for a candidate cause to be named. */
  cause_min_score: number;
  /** days, 365: projections beyond this from the last trip are reported as "not within the data". */
  projection_max_days: number;
  /** resamples, 200: residual bootstrap runs for the projection interval. */
  bootstrap_runs: number;
  /** –, 1: seed of the bootstrap's generator (core is deterministic). */
  bootstrap_seed: number;
}

export const HEALTH_DEFAULTS: Readonly<HealthOptions> = Object.freeze({
  baseline_trips: 10,
  reference_trips: 25,
  ewma_lambda: 0.1,
  ewma_L: 2.814,
  cusum_k: 0.5,
  cusum_h: 5,
  step_k: 1.5,
  step_h: 3,
  rearm_trips: 5,
  sigma_floor: 0.01,
  level_window_trips: 30,
  min_level_trips: 3,
  soak_tolerance_k: 2.5,
  soak_window: 5,
  soak_min_hits: 3,
  sensor_flag_window: 10,
  sensor_flag_share: 0.3,
  coolant_dt_rise: 0.15,
  fan_saturation_rise: 0.05,
  cause_min_score: 0.5,
  projection_max_days: 365,
  bootstrap_runs: 200,
  bootstrap_seed: 1,
});

export function resolveHealthOptions(o: Partial<HealthOptions> = {}): HealthOptions {
  const out = { ...HEALTH_DEFAULTS, ...o };
  for (const [k, v] of Object.entries(out)) {
    if (!Number.isFinite(v))
      throw new RangeError(`assessVehicle: option ${k} must be a finite number, got ${v}`);
  }
  if (out.baseline_trips < 3) throw new RangeError('assessVehicle: option baseline_trips must be ≥ 3');
  return out;
}
