import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type TripResult, type VehicleConfigInput } from '@thermargin/shared';
import type { Band } from '@thermargin/core/trip/bands';
import { runScenario, type Scenario, type ScenarioRun } from '../../support/forward-model/scenario.ts';

/** One band's comparison of the estimator against the forward model's truth. */
export interface BandComparison {
  band: Band;
  estimated_w_m2k: number | null;
  true_w_m2k: number | null;
  /** %: (estimated − true) / true · 100, NaN when either is missing. */
  error_pct: number;
  reason: string | null;
  /** s in the band with the radiator in charge (truth) and windows the estimator used. */
  truth_s: number;
  n_samples: number;
}

export interface Recovery {
  run: ScenarioRun;
  trip: TripResult;
  ram: BandComparison;
  fan: BandComparison;
}

function compare(band: Band, run: ScenarioRun, trip: TripResult): BandComparison {
  const est = band === 'ram' ? trip.k_ram_w_m2k : trip.k_fan_w_m2k;
  const truth = run.truth[band].k_w_m2k;
  return {
    band,
    estimated_w_m2k: est,
    true_w_m2k: truth,
    error_pct: est !== null && truth !== null ? ((est - truth) / truth) * 100 : Number.NaN,
    reason: band === 'ram' ? trip.k_ram_reason : trip.k_fan_reason,
    truth_s: run.truth[band].seconds,
    n_samples: band === 'ram' ? trip.n_ram : trip.n_fan,
  };
}

/**
 * Runs the forward model, feeds its telemetry to the estimator, and compares each band with the truth.
 * `fleet` overrides fields of the vehicle's fleet-file entry (a figure the engineer got wrong).
 */
export function recover(s: Scenario, fleet: Partial<VehicleConfigInput> = {}): Recovery {
  const run = runScenario(s);
  const analysis = analyzeVehicle(
    resolveVehicle({ ...run.config, ...fleet }),
    columnsFromSamples(run.samples),
  );
  if (analysis.trips.length !== 1)
    throw new Error(`expected one trip, the estimator found ${analysis.trips.length}`);
  const trip = analysis.trips[0]!;
  return { run, trip, ram: compare('ram', run, trip), fan: compare('fan', run, trip) };
}

/** One line of the error table, for assertion messages and the printed summary. */
export function formatComparison(label: string, c: BandComparison): string {
  const f = (x: number | null) => (x === null ? 'null' : x.toFixed(0));
  const err = Number.isNaN(c.error_pct) ? 'n/a' : `${c.error_pct >= 0 ? '+' : ''}${c.error_pct.toFixed(2)} %`;
  return (
    `${label} ${c.band}: estimated ${f(c.estimated_w_m2k)} true ${f(c.true_w_m2k)} W/(m²K) error ${err}` +
    ` (truth ${c.truth_s.toFixed(0)} s in band, ${c.n_samples} samples used${c.reason ? `; ${c.reason}` : ''})`
  );
}

/** %: the band tolerances of the issue: ram-band k within ±3 %, fan-band k within ±5 %. */
export const TOLERANCE_PCT = { ram: 3, fan: 5 } as const;

/** Collects table rows during a file's tests and prints them once at the end (a report, not an assertion). */
export class ErrorTable {
  private readonly rows: string[] = [];
  constructor(private readonly title: string) {}
  add(label: string, c: BandComparison): string {
    const line = formatComparison(label, c);
    this.rows.push(line);
    return line;
  }
  print(): void {
    console.log(`${this.title}\n${this.rows.join('\n')}`);
  }
}
