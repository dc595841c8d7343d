import type { AirsideFit, Cause, DesignPoint, Powertrain, Status, TripResult } from '@thermargin/shared';
import type { Band } from '../trip/bands.ts';
import { designBand, designKa_w_k } from '../trip/design-point.ts';
import { type VehicleOutcome, vehicleResult } from '../vehicle-result.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { answerDesign, type DesignAnswer } from './calculator.ts';
import type { DerateTotals } from './derate-tally.ts';
import { type DutyCycle, percentileKey, type TimeAbove } from './duty-cycle.ts';
import { type BandFieldK, fieldK } from './field-k.ts';
import { type BandFouling, foulingRates } from './fouling-rate.ts';
import type { LogHistogram } from './log-histogram.ts';
import type { SizingOptions } from './options.ts';
import type { VehicleSamples } from './vehicle-samples.ts';
import { roundTo } from '../stats/round.ts';

/** Recorded derates (derate = 1) of a vehicle or group. */
export interface DerateSummary extends DerateTotals {
  share_of_time: number;
  /** kW: percentiles of the heat load that led into each event (the demand mean at onset). */
  onset_heat_kw: Record<string, number> | null;
  /** kW: percentiles of the heat generated while derated (already limited by the controller). */
  heat_kw_while_derated: Record<string, number> | null;
}

/** One "what if" for one vehicle: the replayed derates on the days it drove. */
export interface WhatIfVehicle extends DerateTotals {
  ambient_rise_k: number;
  limit_drop_k: number;
  coolant_limit_c: number;
  /** °C: the design ambient the scenario stands for. */
  design_ambient_c: number;
  /** h driven that could not be replayed (no field or bench k known for the trip). */
  hours_not_replayed: number;
}

/**
 * The design point and what the field evidence says about it for one vehicle. Its margins differ from
 * the one `thermargin analyze` reports (margin_now_pct) only by what they name: margin_design_k_pct takes
 * the k named by k_source instead of the band's current level, margin_pct adds the fouling allowance
 * named by allowance_source.
 */
export interface DesignCheck extends DesignAnswer {
  band: Band;
  /** Which k went in: the clean field k, the median field k, or the bench k. */
  k_source: 'field_clean' | 'field_median' | 'bench';
  /** W/(m²·K): that k moved to the design air condition (clean core). */
  k_design_w_m2k: number;
  /** –: the fouling allowance applied. */
  fouling_allowance: number;
  /** Where the fouling allowance came from. */
  allowance_source: 'fouling_fit' | 'default';
  /** Why the default was used although k was fitted (the fit's allowance was implausible); else null. */
  allowance_note: string | null;
  /** %: the margin analyze reports now (the governing band's current level); null when not judged. */
  margin_now_pct: number | null;
  /** The status and cause the health assessment names now: what stands between now and clean. */
  status_now: Status;
  cause_now: Cause;
  /** %: the installed area's margin with k_design_w_m2k and no allowance. */
  margin_design_k_pct: number | null;
}

export interface VehicleSizing {
  id: string;
  type: string;
  powertrain: Powertrain;
  radiator_area_m2: number;
  coolant_limit_c: number;
  design: DesignPoint;
  trips: number;
  km: number;
  field_k: BandFieldK[];
  fouling: BandFouling[];
  design_check: DesignCheck | null;
  /** Sample-level evidence; null when the caller had trip results only. */
  duty_cycle: DutyCycle | null;
  derate: DerateSummary | null;
  what_if: WhatIfVehicle[] | null;
  /** The air side the vehicle stage learned (null when sized without it). */
  airside_fit: AirsideFit | null;
}

const r3 = (x: number) => roundTo(x, 3);

export function percentilesOf(h: LogHistogram, ps: readonly number[]): Record<string, number> | null {
  if (h.total <= 0) return null;
  return Object.fromEntries(ps.map((p) => [percentileKey(p), r3(h.quantile(p)!)]));
}

/** Hours above each heat level (share of the design heat) in a vehicle's heat histogram. */
export function timeAbove(h: LogHistogram, design_kw: number, o: SizingOptions): TimeAbove[] {
  return o.heat_levels_share.map((share) => {
    const s = h.weightAbove(share * design_kw);
    return {
      share_of_design: share,
      heat_kw: r3(share * design_kw),
      hours: r3(s / 3600),
      share_of_time: h.total > 0 ? r3(s / h.total) : 0,
    };
  });
}

/**
 * The design point checked against the field: design band k (clean fit, else median, else bench) moved
 * to the design air condition, the fouling allowance for the planned cleaning interval from the fit
 * (else the default), and the installed area's supported heat and ambient.
 */
function designCheck(
  v: VehicleModel,
  fk: BandFieldK[],
  fouling: BandFouling[],
  o: SizingOptions,
  health: VehicleOutcome,
): DesignCheck | null {
  const band = designBand(v);
  const f = fk.find((x) => x.band === band)!;
  const [kRef, k_source] =
    f.k_clean_w_m2k !== null
      ? [f.k_clean_w_m2k, 'field_clean' as const]
      : f.k_w_m2k !== null
        ? [f.k_w_m2k, 'field_median' as const]
        : f.bench_k_w_m2k !== null
          ? [f.bench_k_w_m2k, 'bench' as const]
          : [null, null];
  if (kRef === null || k_source === null) return null;
  const fit = fouling.find((x) => x.band === band);
  const fitted = fit?.fouling_allowance ?? null;
  const allowance = fitted ?? o.default_fouling_allowance;
  const k = designKa_w_k(v, band, kRef) / v.radiator_area_m2;
  const question = {
    ambient_c: v.design.ambient_c,
    heat_kw: v.design.heat_kw,
    coolant_limit_c: v.coolant_limit_c,
    k_w_m2k: k,
    area_m2: v.radiator_area_m2,
  };
  return {
    band,
    k_source,
    k_design_w_m2k: roundTo(k, 1),
    fouling_allowance: allowance,
    allowance_source: fitted === null ? 'default' : 'fouling_fit',
    allowance_note: fitted === null ? (fit?.fouling_allowance_note ?? null) : null,
    margin_now_pct: health.result.margin_pct ?? null,
    status_now: health.result.status!,
    cause_now: health.result.cause!,
    margin_design_k_pct: answerDesign({ ...question, fouling_allowance: 0 }).margin_pct,
    ...answerDesign({ ...question, fouling_allowance: allowance }),
  };
}

function whatIf(v: VehicleModel, s: VehicleSamples): WhatIfVehicle[] {
  return s.replays.map((rep) => ({
    ambient_rise_k: rep.scenario.ambient_rise_k,
    limit_drop_k: rep.scenario.limit_drop_k,
    coolant_limit_c: rep.coolant_limit_c,
    design_ambient_c: v.design.ambient_c + rep.scenario.ambient_rise_k,
    hours_not_replayed: r3(rep.skipped_s / 3600),
    ...rep.tally.totals(),
  }));
}

/**
 * Everything the sizing evidence says about one vehicle. `trips` in time order, as the trip stage gave
 * them: the vehicle stage (vehicleResult, the same as analyze) learns the air side and corrections,
 * and its causes keep other faults out of the fouling fit; its margin stands beside the design check's.
 */
export function sizeVehicle(
  vehicle: VehicleModel,
  tripStage: readonly TripResult[],
  samples: VehicleSamples | null,
  o: SizingOptions,
): VehicleSizing {
  const health = vehicleResult(vehicle, tripStage);
  const v = health.learned;
  const trips = health.result.trips;
  const fouling = foulingRates(
    v,
    trips,
    o,
    trips.map((t) => t.cause),
  );
  const fk = fieldK(v, trips, fouling);
  let duty: DutyCycle | null = null;
  let derate: DerateSummary | null = null;
  if (samples) {
    duty = samples.duty.summary(o.percentiles, timeAbove(samples.duty.all, v.design.heat_kw, o));
    const totals = samples.derate.totals();
    derate = {
      ...totals,
      share_of_time: totals.of_hours > 0 ? r3(totals.hours / totals.of_hours) : 0,
      onset_heat_kw: percentilesOf(samples.onsetHeat, o.percentiles),
      heat_kw_while_derated: percentilesOf(samples.heatWhileDerated, o.percentiles),
    };
  }
  return {
    id: v.id,
    type: v.type,
    powertrain: v.powertrain,
    radiator_area_m2: v.radiator_area_m2,
    coolant_limit_c: v.coolant_limit_c,
    design: v.design,
    trips: trips.length,
    km: Math.round(trips.reduce((s, t) => s + t.distance_km, 0) * 10) / 10,
    field_k: fk,
    fouling,
    design_check: designCheck(v, fk, fouling, o, health),
    duty_cycle: duty,
    derate,
    what_if: samples ? whatIf(v, samples) : null,
    airside_fit: health.result.airside_fit ?? null,
  };
}
