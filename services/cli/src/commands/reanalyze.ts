import { parseArgs } from 'node:util';
import { UsageError } from '../usage-error.ts';
import { openSampleStore } from '@thermargin/store';
import { openResults } from '@thermargin/store/results-backend';
import { createAnalyzer } from '@thermargin/analyzer/analyzer';
import { storedDeployment } from '../stored-deployment.ts';
import { loadFleetFile } from '@thermargin/usecases/fleet-file';

export const REANALYZE_USAGE = `thermargin reanalyze [--vehicle ID] [--since DATE]
  recomputes stored results after a fleet-file or policy change (reads FLEET_FILE, STORE_*, RESULTS_*)
  --vehicle  only this vehicle (default: every vehicle with samples)
  --since    from this date on, YYYY-MM-DD or ISO 8601 UTC (default: all samples)`;

export async function reanalyzeCommand(argv: string[], log: (line: string) => void): Promise<void> {
  const { values } = parseArgs({
    args: argv,
    options: { vehicle: { type: 'string' }, since: { type: 'string' } },
    strict: true,
  });
  let since_ms: number | undefined;
  if (values.since !== undefined) {
    since_ms = Date.parse(
      /^\d{4}-\d{2}-\d{2}$/.test(values.since) ? `${values.since}T00:00:00Z` : values.since,
    );
    if (!Number.isFinite(since_ms))
      throw new UsageError([{ where: '--since', rule: 'must be YYYY-MM-DD or ISO 8601 UTC' }]);
  }
  const config = storedDeployment('stores', process.env);
  const fleet = loadFleetFile(config.fleet_file);
  if (values.vehicle !== undefined && !fleet.models.has(values.vehicle))
    throw new UsageError([{ where: '--vehicle', rule: `${values.vehicle} is not in the fleet file` }]);
  const samples = openSampleStore(config.samples);
  const results = await openResults(config.results).catch(async (e) => {
    await samples.close();
    throw e;
  });
  const analyzer = createAnalyzer({
    samples,
    results: results.analysis,
    fleet: () => fleet.models,
    extraMaintenance: async (v) => (await results.workflow.maintenance(v)).map((m) => m.entry),
  });
  try {
    const t0 = performance.now();
    await analyzer.reanalyze({
      ...(values.vehicle === undefined ? {} : { vehicle: values.vehicle }),
      ...(since_ms === undefined ? {} : { since_ms }),
    });
    const s = analyzer.stats;
    log(
      `reanalysed ${s.trips_analysed} trips from ${s.samples_analysed.toLocaleString('en-US')} samples in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    );
  } finally {
    await samples.close();
    await results.close();
  }
}
