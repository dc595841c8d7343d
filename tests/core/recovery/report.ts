/**
 * Prints the recovery suite's figures per band (median and p90 |error| of per-trip k, coverage) over
 * vehicle histories drawn from seeds: `node --import tsx tests/core/recovery/report.ts [seeds]
 * [histories per seed] [trips per history] [--trips] [--aux-known]`. Seeds are a comma list (default
 * 101,102,103: seeds nobody tuned on); `--trips` also prints every history's worst trips; `--aux-known`
 * gives the fleet file each vehicle's true unmeasured heat. Figures follow for all histories, then apart
 * for those with and without a coolant flow meter.
 */
import { BAND_NAMES } from '@thermargin/core/trip/bands';
import {
  bandFigures,
  formatFigures,
  GOALS,
  type HistoryRecovery,
  histories,
  recoverHistory,
} from './history-suite.ts';

function seedsOf(arg: string | undefined): number[] {
  return arg ? arg.split(',').map(Number) : [101, 102, 103];
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const args = process.argv.slice(2).filter((a) => !a.startsWith('--'));
  const detail = process.argv.includes('--trips');
  // The fleet file given each vehicle's true unmeasured heat (aux_heat_kw): what the figure buys.
  const auxKnown = process.argv.includes('--aux-known');
  const seeds = seedsOf(args[0]);
  const count = Number(args[1] ?? 12);
  const trips = args[2] === undefined ? undefined : Number(args[2]);
  const runs: HistoryRecovery[] = [];
  for (const seed of seeds) {
    for (const drawn of histories(seed, count, trips)) {
      const h = auxKnown
        ? { ...drawn, fleet: { ...drawn.fleet, aux_heat_kw: drawn.unmeasured_heat_kw } }
        : drawn;
      const r = recoverHistory(h);
      runs.push(r);
      const fit = (r.result as { airside_fit?: unknown }).airside_fit;
      console.log(h.label);
      if (fit) console.log(`  airside_fit ${JSON.stringify(fit)}`);
      for (const band of BAND_NAMES) console.log(`  ${formatFigures(bandFigures(r.rows, band))}`);
      if (detail) {
        const worst = r.rows
          .filter((x) => !Number.isNaN(x.error_pct))
          .sort((a, b) => Math.abs(b.error_pct) - Math.abs(a.error_pct))
          .slice(0, 4);
        for (const w of worst)
          console.log(`    ${w.trip} ${w.band} ${w.error_pct >= 0 ? '+' : ''}${w.error_pct.toFixed(2)} %`);
      }
    }
  }
  const rows = runs.flatMap((r) => r.rows);
  console.log(`\nall ${runs.length} histories, seeds ${seeds.join(',')}:`);
  for (const band of BAND_NAMES) console.log(formatFigures(bandFigures(rows, band)));
  // Where the goals hold and where the data bound them: heat rejected measured, or a heat balance.
  for (const meter of [true, false]) {
    const some = runs.filter((r) => (r.history.trips[0]?.sensors?.flow_meter ?? false) === meter);
    console.log(`\n${some.length} histories with the flow meter ${meter ? 'on' : 'off'}:`);
    for (const band of BAND_NAMES)
      console.log(
        formatFigures(
          bandFigures(
            some.flatMap((r) => r.rows),
            band,
          ),
        ),
      );
  }
  console.log(
    `goals: median ≤ ${GOALS.median_abs_error_pct.ram} %, p90 ≤ ${GOALS.p90_abs_error_pct.ram} % ram / ≤ ${GOALS.p90_abs_error_pct.fan} % fan, coverage ≥ ${GOALS.coverage * 100} %`,
  );
}
