import { FAN_REFERENCE, RAM_REFERENCE } from '@thermargin/core/radiator/airside';
import { type Band, bandOf } from '@thermargin/core/trip/bands';
import { airFaceVelocity_ms } from './airflow.ts';
import type { LoopTrace } from './loop.ts';
import { coreK_w_m2k, type Fouling } from './radiator.ts';
import type { VehicleSpec } from './vehicle-spec.ts';

/** ITD below which the estimator's contract ignores a sample (K). */
const MIN_ITD_K = 10;
const REFERENCE = { ram: RAM_REFERENCE, fan: FAN_REFERENCE } as const;

/** Steps of the true trace where the band applies and the radiator is in charge (true, noise-free state). */
export function bandSteps(v: VehicleSpec, tr: LoopTrace, band: Band): number[] {
  const out: number[] = [];
  for (let i = 0; i < tr.n; i++) {
    const T = tr.coolant_c[i]!;
    if (T < v.thermostat.full_open_c || T - tr.ambient_c[i]! < MIN_ITD_K) continue;
    if (bandOf(tr.speed_kmh[i]!, tr.fan_pct[i]!) === band) out.push(i);
  }
  return out;
}

export interface BandTruth {
  /** W/(m²·K): the model's k at the band's reference air condition, mean over the band's steps, or null. */
  k_w_m2k: number | null;
  /** s of the trip in the band with the radiator in charge. */
  seconds: number;
}

/**
 * The truth the estimator's band k is compared with: the core's own k = Q/(A·ITD) evaluated at the
 * band's reference air condition (ram 80 km/h fan 0 %, fan 0 km/h fan 100 %) with the coolant flow,
 * ambient, coolant temperature and fouling the vehicle actually had in that band on this trip.
 */
export function bandTruth(v: VehicleSpec, tr: LoopTrace, band: Band, fouling: Fouling): BandTruth {
  const steps = bandSteps(v, tr, band);
  const ref = REFERENCE[band];
  const face_velocity_ms = airFaceVelocity_ms(v.airflow, ref.speed_kmh, ref.fan_pct);
  let k = 0;
  for (const i of steps) {
    const p = {
      face_velocity_ms,
      flow_lpm: tr.radiator_flow_lpm[i]!,
      ambient_c: tr.ambient_c[i]!,
      coolant_in_c: tr.coolant_c[i]!,
    };
    k += coreK_w_m2k(v.core, p, fouling);
  }
  return { k_w_m2k: steps.length > 0 ? k / steps.length : null, seconds: steps.length * tr.step_s };
}

/**
 * –: what ignoring the heat storage would do to a median-of-windows estimate, from the true trace:
 * the band's steps cut into contiguous windows of `window_s`, each window's Σ heat generated /
 * Σ heat rejected − 1, and the median over windows. Windows shorter than half `window_s` are dropped.
 */
export function windowStorageBias(v: VehicleSpec, tr: LoopTrace, band: Band, window_s: number): number {
  const steps = bandSteps(v, tr, band);
  const per = Math.round(window_s / tr.step_s);
  const ratios: number[] = [];
  let gen = 0;
  let rej = 0;
  let count = 0;
  const flush = () => {
    if (count >= per / 2 && rej > 0) ratios.push(gen / rej - 1);
    gen = rej = count = 0;
  };
  steps.forEach((i, j) => {
    if (j > 0 && (i !== steps[j - 1]! + 1 || count >= per)) flush();
    gen += tr.heat_kw[i]!;
    rej += tr.rejected_kw[i]!;
    count++;
  });
  flush();
  ratios.sort((a, b) => a - b);
  return ratios.length ? ratios[Math.floor(ratios.length / 2)]! : Number.NaN;
}
