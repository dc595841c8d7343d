import { analyzeVehicle } from '@thermargin/core/analyze';
import { quantileSorted } from '@thermargin/core/stats/quantile';
import { BAND_NAMES, type Band } from '@thermargin/core/trip/bands';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type Sample, type VehicleResult } from '@thermargin/shared';
import type { TripProfile } from '../../support/forward-model/drive-profile.ts';
import { drawHistory, type History } from '../../support/forward-model/history.ts';
import { simulateLoop } from '../../support/forward-model/loop.ts';
import { substream } from '../../support/forward-model/prng.ts';
import { driveTrace } from '../../support/forward-model/drive-profile.ts';
import { CLEAN } from '../../support/forward-model/radiator.ts';
import { MODEL_STEP_S, runScenario } from '../../support/forward-model/scenario.ts';
import { SENSOR_DEFAULTS } from '../../support/forward-model/sensors.ts';
import { bandSteps } from '../../support/forward-model/truth.ts';
import type { VehicleSpec } from '../../support/forward-model/vehicle-spec.ts';

/** Band samples with the thermostat fully open that entitle a trip to a k in that band. */
export const COVERAGE_MIN_SAMPLES = 100;

/** One trip's band k against the forward model's truth. */
export interface TripBandRecovery {
  history: string;
  trip: string;
  band: Band;
  /** Samples the logger took in the band with the radiator in charge (true state). */
  eligible_samples: number;
  true_w_m2k: number | null;
  estimated_w_m2k: number | null;
  /** The stated 95 % interval of the estimate. */
  ci95: [number, number] | null;
  /** %: (estimated − true) / true · 100; NaN when either is missing. */
  error_pct: number;
  reason: string | null;
}

export interface HistoryRecovery {
  history: History;
  result: VehicleResult;
  rows: TripBandRecovery[];
}

/** kW: mean traction heat into the coolant over the hot trip's in-charge steps (the pilot for unmeasured heat). */
export function pilotMeanLoad(v: VehicleSpec, profile: TripProfile): number {
  const tr = simulateLoop(v, driveTrace(profile, MODEL_STEP_S, substream(1, 0)), CLEAN);
  const steps = [...bandSteps(v, tr, 'ram'), ...bandSteps(v, tr, 'fan')];
  return steps.reduce((s, i) => s + tr.heat_kw[i]!, 0) / Math.max(1, steps.length);
}

/** Simulates a history, runs it through the core as the CLI does (analyze, then the vehicle stage), and compares. */
export function recoverHistory(h: History): HistoryRecovery {
  const samples: Sample[] = [];
  const truths = h.trips.map((s) => {
    const run = runScenario(s);
    for (const x of run.samples) samples.push(x);
    const every = Math.round((s.sensors?.interval_s ?? SENSOR_DEFAULTS.interval_s) / run.trace.step_s);
    const eligible = Object.fromEntries(
      BAND_NAMES.map((b) => [b, bandSteps(s.vehicle, run.trace, b).filter((i) => i % every === 0).length]),
    ) as Record<Band, number>;
    return { trip: s.trip!, truth: run.truth, eligible };
  });
  const model = resolveVehicle(h.fleet);
  const analysed = analyzeVehicle(model, columnsFromSamples(samples));
  const result = vehicleResult(model, analysed.trips).result;
  const byId = new Map(result.trips.map((t) => [t.trip, t]));
  const rows: TripBandRecovery[] = [];
  for (const t of truths) {
    const r = byId.get(t.trip);
    for (const band of BAND_NAMES) {
      const est = r ? (band === 'ram' ? r.k_ram_w_m2k : r.k_fan_w_m2k) : null;
      const ci95 = r ? (band === 'ram' ? r.k_ram_ci95 : r.k_fan_ci95) : null;
      const truth = t.truth[band].k_w_m2k;
      rows.push({
        history: h.label,
        trip: t.trip,
        band,
        eligible_samples: t.eligible[band],
        true_w_m2k: truth,
        estimated_w_m2k: est,
        ci95,
        error_pct: est !== null && truth !== null ? ((est - truth) / truth) * 100 : Number.NaN,
        reason: r ? (band === 'ram' ? r.k_ram_reason : r.k_fan_reason) : 'trip not found',
      });
    }
  }
  return { history: h, result, rows };
}

export function histories(seed: number, count: number, trips?: number): History[] {
  return Array.from({ length: count }, (_, i) =>
    drawHistory(seed, i, pilotMeanLoad, trips === undefined ? undefined : { trips }),
  );
}

/** The suite's figures for one band. */
export interface BandFigures {
  band: Band;
  trips_with_k: number;
  median_abs_error_pct: number;
  p90_abs_error_pct: number;
  /** Trips with ≥ COVERAGE_MIN_SAMPLES eligible samples in the band, and the share of them with a k. */
  entitled: number;
  coverage: number;
  /** Entitled trips without a k, by reason (first words). */
  missed: Record<string, number>;
  /** Share of trips with a k and an interval whose stated 95 % interval holds the true k. */
  interval_coverage: number;
  /** %: median half-width of those intervals relative to k. */
  median_half_width_pct: number;
}

export function bandFigures(rows: readonly TripBandRecovery[], band: Band): BandFigures {
  const mine = rows.filter((r) => r.band === band);
  const errs = Float64Array.from(
    mine.filter((r) => !Number.isNaN(r.error_pct)).map((r) => Math.abs(r.error_pct)),
  ).sort();
  const entitled = mine.filter((r) => r.eligible_samples >= COVERAGE_MIN_SAMPLES);
  const missed: Record<string, number> = {};
  for (const r of entitled) {
    if (r.estimated_w_m2k !== null) continue;
    const why = (r.reason ?? 'no reason')
      .replace(/^\w+ band: /, '')
      .split(/[;(]/)[0]!
      .replace(/\d+/g, 'N');
    missed[why] = (missed[why] ?? 0) + 1;
  }
  const stated = mine.filter((r) => r.ci95 !== null && r.true_w_m2k !== null && r.estimated_w_m2k !== null);
  const holds = stated.filter((r) => r.ci95![0] <= r.true_w_m2k! && r.true_w_m2k! <= r.ci95![1]);
  const widths = Float64Array.from(
    stated.map((r) => ((r.ci95![1] - r.ci95![0]) / 2 / r.estimated_w_m2k!) * 100),
  ).sort();
  return {
    band,
    trips_with_k: errs.length,
    median_abs_error_pct: errs.length ? quantileSorted(errs, 0.5) : Number.NaN,
    p90_abs_error_pct: errs.length ? quantileSorted(errs, 0.9) : Number.NaN,
    entitled: entitled.length,
    coverage: entitled.length
      ? entitled.filter((r) => r.estimated_w_m2k !== null).length / entitled.length
      : Number.NaN,
    missed,
    interval_coverage: stated.length ? holds.length / stated.length : Number.NaN,
    median_half_width_pct: widths.length ? quantileSorted(widths, 0.5) : Number.NaN,
  };
}

/** The goals: median |error| ≤ 1.0 % in both bands, p90 ≤ 3.0 % ram and ≤ 4.0 % fan, coverage ≥ 95 %. */
export const GOALS = {
  median_abs_error_pct: { ram: 1.0, fan: 1.0 },
  p90_abs_error_pct: { ram: 3.0, fan: 4.0 },
  coverage: 0.95,
} as const;

export function formatFigures(f: BandFigures): string {
  const missed = Object.entries(f.missed)
    .map(([why, n]) => `${n}× ${why.trim()}`)
    .join('; ');
  return (
    `${f.band.padEnd(3)}  median |error| ${f.median_abs_error_pct.toFixed(2)} %  p90 ${f.p90_abs_error_pct.toFixed(2)} %` +
    `  coverage ${(f.coverage * 100).toFixed(1)} % of ${f.entitled} trips  (${f.trips_with_k} trips with k)` +
    `\n     stated 95 % interval holds the true k on ${(f.interval_coverage * 100).toFixed(1)} % (median half-width ${f.median_half_width_pct.toFixed(2)} %)` +
    (missed ? `\n     missed: ${missed}` : '')
  );
}
