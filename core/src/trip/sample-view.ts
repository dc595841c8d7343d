import type { SampleColumns } from '@thermargin/shared';
import { heatToCoolant_kw } from '../drivetrain/heat.ts';
import { bandFactor } from '../radiator/airside.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { type Band, bandOf } from './bands.ts';
import type { EstimatorOptions } from './estimator-options.ts';
import { FullOpenGate } from './full-open.ts';
import { priorReferral, type Referral, windowK_w_m2k } from './refer.ts';
import { tripWindows } from './windows.ts';

/** Per sample of one trip (cleaned, time-sorted columns [from, to)), for charts; NaN where none. */
export interface TripSampleView {
  heat_generated_kw: Float64Array;
  /** kW: Q = k·A·g·ITD with the sample's window k and air-flow factor g; NaN outside valid windows. */
  heat_rejected_kw: Float64Array;
  /** W/(m²·K): k of the valid window the sample belongs to, at the band's reference condition. */
  k_w_m2k: Float64Array;
  /** 1 ram, 2 fan: the band whose k the sample counted for; 0 none. */
  counted: Uint8Array;
}

const BAND_CODE: Record<Band, number> = { ram: 1, fan: 2 };

/**
 * Which samples counted for a band's k on a trip, and with what k. Windows are cut by the rules of
 * tripWindows (band change, a step over max_step_s, window_s reached); each window is then judged by
 * tripWindows itself, so a sample counts exactly when its window was accepted there. With a sensor lag
 * the lag filter restarts at each window here (it runs through the trip there): a display difference only.
 */
export function tripSampleView(
  c: SampleColumns,
  from: number,
  to: number,
  v: VehicleModel,
  o: EstimatorOptions,
  /** The referral the trip's k was made with; default the fleet file's (the trip stage's). */
  r: Referral = priorReferral(v),
): TripSampleView {
  const n = to - from;
  const view: TripSampleView = {
    heat_generated_kw: new Float64Array(n),
    heat_rejected_kw: new Float64Array(n).fill(Number.NaN),
    k_w_m2k: new Float64Array(n).fill(Number.NaN),
    counted: new Uint8Array(n),
  };
  const a = r.airside;
  const maxStep_ms = o.max_step_s * 1000;
  const window_ms = o.window_s * 1000;
  let band: Band | null = null;
  let start = from;
  let t0 = 0;
  let last = 0;
  let startOpen = false;
  const gate = new FullOpenGate(v, o);
  const judge = (end: number) => {
    if (band === null) return;
    const k = windowK_w_m2k(
      band,
      tripWindows(c, start, end, v, o, startOpen)[band].evidence,
      v.radiator_area_m2,
      r,
    )[0];
    if (k === undefined || Number.isNaN(k)) return;
    for (let i = start; i < end; i++) {
      const g = bandFactor(a, band, c.speed_kmh[i]!, c.fan_pct[i]!);
      view.k_w_m2k[i - from] = k;
      view.heat_rejected_kw[i - from] =
        (k * v.radiator_area_m2 * g * (c.coolant_in_c[i]! - c.ambient_c[i]! - r.ambient_correction_k)) / 1000;
      view.counted[i - from] = BAND_CODE[band];
    }
  };
  for (let i = from; i < to; i++) {
    const t = c.time_ms[i]!;
    view.heat_generated_kw[i - from] = heatToCoolant_kw(
      c.power_kw[i]!,
      v.drivetrain_efficiency,
      v.coolant_heat_fraction,
    );
    const Tin = c.coolant_in_c[i]!;
    const prevOpen = gate.isOpen;
    const inCharge = gate.inCharge(Tin, Tin - c.ambient_c[i]!);
    const b = inCharge ? bandOf(c.speed_kmh[i]!, c.fan_pct[i]!) : null;
    if (band !== null && (b !== band || t - last > maxStep_ms || t - t0 >= window_ms)) {
      judge(i);
      band = null;
    }
    if (b === null) continue;
    if (band === null) {
      band = b;
      start = i;
      startOpen = prevOpen;
      t0 = t;
    }
    last = t;
  }
  judge(to);
  return view;
}
