import type { SampleColumns, TripResult } from '@thermargin/shared';
import { heatToCoolant_kw } from '../drivetrain/heat.ts';
import { median } from '../stats/quantile.ts';
import { quantileInPlace } from '../stats/select.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { estimateBand } from './band-estimate.ts';
import type { Band } from './bands.ts';
import { designMargin } from './design-point.ts';
import type { EstimatorOptions } from './estimator-options.ts';
import { SENSOR_CHECK_DEFAULTS, soakOffset_k, stuckSignals } from './sensor-checks.ts';
import { priorReferral, windowK_w_m2k } from './refer.ts';
import type { TripSpan } from './split.ts';
import { tripWindows } from './windows.ts';
import { roundTo as round } from '../stats/round.ts';

export interface TripContext {
  /** Epoch ms of the previous trip's last sample (null for the first trip seen). */
  previousEnd_ms: number | null;
  /** Samples rejected by cleaning within this trip's time span, by reason. */
  rejected: Record<string, number>;
}

const iso = (ms: number) => new Date(ms).toISOString().replace(/\.000Z$/, 'Z');

/**
 * One trip's result: heat load statistics (heat generated into the coolant, drivetrain/heat.ts), derate time,
 * temperatures, the band k estimates with intervals, margin and limiting ambient at the design point,
 * and the evidence the health module reads. Each sample holds until the next one, up to max_step_s.
 */
export function analyzeTrip(
  c: SampleColumns,
  span: TripSpan,
  v: VehicleModel,
  o: EstimatorOptions,
  ctx: TripContext,
): TripResult {
  const { from, to } = span;
  const n = to - from;
  const heat = new Float64Array(n);
  const maxStep_ms = o.max_step_s * 1000;
  let time_s = 0;
  let dist_km = 0;
  let energy_kwh = 0;
  let derate_s = 0;
  let fanSat_s = 0;
  let coolantMax = Number.NEGATIVE_INFINITY;
  let ambMax = Number.NEGATIVE_INFINITY;
  let ambSum = 0;
  let heatMax = 0;
  for (let i = from; i < to; i++) {
    const q = heatToCoolant_kw(c.power_kw[i]!, v.drivetrain_efficiency, v.coolant_heat_fraction);
    heat[i - from] = q;
    if (q > heatMax) heatMax = q;
    const dt_s = i + 1 < to ? Math.min(c.time_ms[i + 1]! - c.time_ms[i]!, maxStep_ms) / 1000 : 0;
    time_s += dt_s;
    dist_km += (c.speed_kmh[i]! * dt_s) / 3600;
    energy_kwh += (q * dt_s) / 3600;
    if (c.derate[i] === 1) derate_s += dt_s;
    if (c.fan_pct[i]! >= SENSOR_CHECK_DEFAULTS.fan_saturated_pct) fanSat_s += dt_s;
    if (c.coolant_in_c[i]! > coolantMax) coolantMax = c.coolant_in_c[i]!;
    if (c.ambient_c[i]! > ambMax) ambMax = c.ambient_c[i]!;
    ambSum += c.ambient_c[i]!;
  }
  const sensorFlags = stuckSignals(c, from, to, heat);
  const spikes = Object.entries(ctx.rejected).filter(([reason]) => reason.startsWith('spike_'));
  for (const [reason, count] of spikes)
    sensorFlags.push(`${count} single-sample ${reason.slice(6)} spikes rejected`);

  const w = tripWindows(c, from, to, v, o);
  const prior = priorReferral(v);
  const band = (b: Band) =>
    estimateBand(
      b,
      w[b],
      windowK_w_m2k(b, w[b].evidence, v.radiator_area_m2, prior),
      o,
      v.thermostat_full_open_c,
    );
  const ram = band('ram');
  const fan = band('fan');
  const m = designMargin(v, { ram: ram.k_w_m2k, fan: fan.k_w_m2k });
  const heatMean = time_s > 0 ? (energy_kwh * 3600) / time_s : heat[0]!;
  const p95 = quantileInPlace(heat, 0.95);
  const ci = (x: [number, number] | null) =>
    x ? ([round(x[0], 1), round(x[1], 1)] as [number, number]) : null;
  const opt = (x: number | null, d: number) => (x === null ? null : round(x, d));

  return {
    trip: span.trip,
    start: iso(c.time_ms[from]!),
    end: iso(c.time_ms[to - 1]!),
    samples: n,
    rejected: Object.values(ctx.rejected).reduce((s, x) => s + x, 0),
    distance_km: round(dist_km, 3),
    k_ram_w_m2k: opt(ram.k_w_m2k, 1),
    k_ram_ci95: ci(ram.ci95),
    n_ram: ram.n_samples,
    k_ram_reason: ram.reason,
    k_fan_w_m2k: opt(fan.k_w_m2k, 1),
    k_fan_ci95: ci(fan.ci95),
    n_fan: fan.n_samples,
    k_fan_reason: fan.reason,
    heat_kw_mean: round(heatMean, 3),
    heat_kw_p95: round(p95, 3),
    heat_kw_max: round(heatMax, 3),
    heat_kwh: round(energy_kwh, 4),
    derate_s: round(derate_s, 1),
    coolant_max_c: round(coolantMax, 2),
    ambient_max_c: round(ambMax, 2),
    margin_pct: opt(m.margin_pct, 2),
    limiting_ambient_c: opt(m.limiting_ambient_c, 2),
    margin_basis: m.basis,
    ambient_mean_c: round(ambSum / n, 2),
    soak_offset_k: opt(soakOffset_k(c, from, to, ctx.previousEnd_ms), 2),
    fan_saturated_share: time_s > 0 ? round(fanSat_s / time_s, 4) : 0,
    coolant_dt_per_kw: w.dt_per_kw.length ? round(median(w.dt_per_kw), 5) : null,
    sensor_flags: sensorFlags,
    windows: { ram: w.ram.evidence, fan: w.fan.evidence },
  };
}
