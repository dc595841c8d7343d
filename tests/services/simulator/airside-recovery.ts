/**
 * The recovery suite's second generator: the demo simulator (k a power law of face velocity, a
 * coolant-side ε on top, its own drive cycles, fan control and climate), all vehicles healthy, each
 * vehicle's air side drawn at random about its archetype's (exponent 0.45–0.65, ram ratio and fan
 * velocity ±40 %) and taken out of the fleet file with the bench figures. Per trip and band it compares
 * the core's k with the simulator's own k at the band's reference condition.
 * `node --import tsx tests/services/simulator/airside-recovery.ts [seeds] [vehicles] [days]`
 * (default seeds 201,202,203, 10 vehicles, 21 days).
 */
import { analyzeVehicle } from '@thermargin/core/analyze';
import { FAN_REFERENCE, faceVelocity_ms, RAM_REFERENCE } from '@thermargin/core/radiator/airside';
import { streamFor } from '@thermargin/core/stats/prng';
import { BAND_NAMES, type Band, bandOf } from '@thermargin/core/trip/bands';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples } from '@thermargin/shared';
import { createScenario } from '../../../services/simulator/src/scenario.ts';
import { cleanK_w_m2k } from '../../../services/simulator/src/radiator.ts';
import type { SimVehicle } from '../../../services/simulator/src/vehicle.ts';
import {
  bandFigures,
  formatFigures,
  GOALS,
  type TripBandRecovery,
} from '../../core/recovery/history-suite.ts';

/** K: ITD below which the estimator's contract ignores a sample. */
const MIN_ITD_K = 10;
const REFERENCE = { ram: RAM_REFERENCE, fan: FAN_REFERENCE } as const;

/** The vehicle with its air side drawn about the archetype's; the design point's k kept. */
function varied(v: SimVehicle, seed: number): SimVehicle {
  const rng = streamFor(seed, v.id, 'airside variant');
  const a = v.radiator.airside;
  const airside = {
    ram_face_ratio: a.ram_face_ratio * rng.uniform(0.6, 1.4),
    fan_face_velocity_ms: a.fan_face_velocity_ms * rng.uniform(0.6, 1.4),
    velocity_exponent: rng.uniform(0.45, 0.65),
  };
  const d = v.archetype.design;
  const { airside: _a, bench_k_w_m2k: _b, ...config } = v.config;
  return {
    ...v,
    config,
    radiator: {
      ...v.radiator,
      airside,
      v_design_ms: faceVelocity_ms(d.speed_kmh, d.fan_pct, airside),
    },
  };
}

/** One vehicle's trips through the core as the CLI runs them (analyze, then the vehicle stage), against the truth. */
export function simulatorRecovery(seed: number, vehicles: number, days: number): TripBandRecovery[] {
  const sc = createScenario({ seed, faults: 'none', days, vehicles });
  // The scenario's streams read its vehicles: each is swapped for its variant in place.
  for (const v of sc.vehicles) Object.assign(v, varied(v, seed));
  const rows: TripBandRecovery[] = [];
  for (const v of sc.vehicles) {
    const full = v.config.thermostat_full_open_c ?? v.config.thermostat_open_c + 10;
    const model = resolveVehicle(v.config);
    const trips = analyzeVehicle(model, columnsFromSamples([...sc.vehicleSamples(v.id)])).trips;
    const result = vehicleResult(model, trips).result;
    const truthK = (b: Band) =>
      cleanK_w_m2k(
        v.radiator,
        faceVelocity_ms(REFERENCE[b].speed_kmh, REFERENCE[b].fan_pct, v.radiator.airside),
      );
    for (const t of sc.vehicleTrips(v.id)) {
      const tr = t.truth;
      const r = result.trips.find((x) => Math.abs(Date.parse(x.start) - tr.t0_ms) < 60_000);
      for (const band of BAND_NAMES) {
        let eligible = 0;
        for (let i = 0; i < tr.n; i++)
          if (
            tr.coolant_c[i]! >= full &&
            tr.coolant_c[i]! - tr.ambient_c[i]! >= MIN_ITD_K &&
            bandOf(tr.speed_kmh[i]!, tr.fan_pct[i]!) === band
          )
            eligible++;
        const est = r ? (band === 'ram' ? r.k_ram_w_m2k : r.k_fan_w_m2k) : null;
        const truth = eligible > 0 ? truthK(band) : null;
        rows.push({
          history: `${seed}/${v.id}`,
          trip: r?.trip ?? String(tr.t0_ms),
          band,
          eligible_samples: eligible,
          true_w_m2k: truth,
          estimated_w_m2k: est,
          ci95: r ? (band === 'ram' ? r.k_ram_ci95 : r.k_fan_ci95) : null,
          error_pct: est !== null && truth !== null ? ((est - truth) / truth) * 100 : Number.NaN,
          reason: r ? (band === 'ram' ? r.k_ram_reason : r.k_fan_reason) : 'trip not found',
        });
      }
    }
  }
  return rows;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const [s, n, d] = process.argv.slice(2);
  const seeds = s ? s.split(',').map(Number) : [201, 202, 203];
  const rows = seeds.flatMap((seed) => simulatorRecovery(seed, Number(n ?? 10), Number(d ?? 21)));
  console.log(`demo simulator, seeds ${seeds.join(',')}:`);
  for (const band of BAND_NAMES) console.log(formatFigures(bandFigures(rows, band)));
  console.log(
    `goals: median ≤ ${GOALS.median_abs_error_pct.ram} %, p90 ≤ ${GOALS.p90_abs_error_pct.ram} % ram / ≤ ${GOALS.p90_abs_error_pct.fan} % fan, coverage ≥ ${GOALS.coverage * 100} %`,
  );
}
