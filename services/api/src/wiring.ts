import { type Analyzer, createAnalyzer } from '@thermargin/analyzer/analyzer';
import type { Logger } from '@thermargin/shared/log';
import { openSampleStore, type SampleStore } from '@thermargin/store';
import type { AnalysisStore } from '@thermargin/store/analysis';
import type { ResultChanges } from '@thermargin/store/changes';
import { openResults, type ResultsBackend } from '@thermargin/store/results-backend';
import type { WorkflowStore } from '@thermargin/store/workflow';
import type { ApiConfig } from './config.ts';
import type { FleetSource } from './deps.ts';
import { fileFleetSource } from './fleet-source.ts';
import { parseTokenList, readTokenFile, TokenRegistry } from './tokens.ts';

/** What an API process runs on: its stores, the fleet file, the tokens, and the analyzer if it runs one. */
export interface ApiPieces {
  samples: SampleStore;
  results: AnalysisStore;
  workflow: WorkflowStore;
  /** Numbered result commits and their notifications (PostgreSQL); undefined on SQLite. */
  changes: ResultChanges | undefined;
  fleet: FleetSource;
  tokens: TokenRegistry;
  /** The in-process analyzer (API_RUN_ANALYZER=1), already polling. */
  analyzer: Analyzer | undefined;
  /** Stops the analyzer and closes the stores. */
  close(): Promise<void>;
}

/**
 * Builds the pieces from the configuration, one way for every process that serves the API (`startApi`,
 * `npm start`): the fleet file is read first (an invalid one stops here), then the stores open. The
 * analyzer gets its own connection to the results database, so its transactions never interleave with
 * the API's writes.
 */
export async function wireApi(
  config: ApiConfig,
  o: { clock: () => number; log: Logger },
): Promise<ApiPieces> {
  const { deployment } = config;
  const fleet = fileFleetSource(deployment.fleet_file);
  const configured = [
    ...parseTokenList(config.tokens, 'env'),
    ...(config.tokens_file ? readTokenFile(config.tokens_file) : []),
  ];
  const samples = openSampleStore(deployment.samples);
  const opened: ResultsBackend[] = [];
  try {
    opened.push(await openResults(deployment.results, { log: o.log }));
    if (config.run_analyzer) opened.push(await openResults(deployment.results, { log: o.log }));
  } catch (e) {
    for (const r of opened) await r.close();
    await samples.close();
    throw e;
  }
  const [own, forAnalyzer] = opened as [ResultsBackend, ResultsBackend | undefined];
  let analyzer: Analyzer | undefined;
  if (forAnalyzer) {
    analyzer = createAnalyzer(
      {
        samples,
        results: forAnalyzer.analysis,
        fleet: () => fleet.current().models,
        extraMaintenance: async (v) => (await forAnalyzer.workflow.maintenance(v)).map((m) => m.entry),
        ...(forAnalyzer.leases ? { leases: forAnalyzer.leases } : {}),
        clock: o.clock,
        log: o.log,
      },
      { poll_ms: config.analyzer.poll_ms },
    );
    analyzer.start();
  }
  return {
    samples,
    results: own.analysis,
    workflow: own.workflow,
    changes: own.changes,
    fleet,
    tokens: new TokenRegistry(configured, own.workflow),
    analyzer,
    async close() {
      await analyzer?.stop();
      await forAnalyzer?.close();
      await own.close();
      await samples.close();
    },
  };
}
