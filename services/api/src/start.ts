import type { AddressInfo } from 'node:net';
import { type Analyzer, createAnalyzer } from '@thermargin/analyzer/analyzer';
import { openSampleStore } from '@thermargin/store';
import { createAnalysisStore, openResultsDb } from '@thermargin/store/sqlite-analysis-store';
import { createWorkflowStore } from '@thermargin/store/sqlite-workflow';
import { serve } from '@hono/node-server';
import { createApi } from './app.ts';
import { readApiConfig } from './config.ts';
import type { ApiDeps } from './deps.ts';
import { fileFleetSource } from './fleet-source.ts';
import { parseTokenList, readTokenFile, TokenRegistry } from './tokens.ts';

export interface StartApiOptions {
  /** Overrides API_PORT; 0 picks a free port. */
  port?: number;
  env?: Record<string, string | undefined>;
  clock?: () => number;
  log?: ApiDeps['log'];
}

export interface RunningApi {
  url: string;
  port: number;
  /** The in-process analyzer (API_RUN_ANALYZER=1): `poke()` it after an ingest. */
  analyzer: Analyzer | undefined;
  close(): Promise<void>;
}

/** The API process: stores from the environment, the fleet file, tokens, optionally the analyzer. */
export async function startApi(options: StartApiOptions = {}): Promise<RunningApi> {
  const env = options.env ?? process.env;
  const config = readApiConfig(env);
  const log =
    options.log ?? ((event, detail) => process.stderr.write(`${JSON.stringify({ event, ...detail })}\n`));
  const clock = options.clock ?? Date.now;
  const fleet = fileFleetSource(config.analyzer.fleet_file);
  const samples = openSampleStore(config.analyzer.samples);
  const apiDb = openResultsDb(config.analyzer.results_path);
  const results = createAnalysisStore(apiDb);
  const workflow = createWorkflowStore(apiDb);
  const configured = [
    ...parseTokenList(config.tokens, 'env'),
    ...(config.tokens_file ? readTokenFile(config.tokens_file) : []),
  ];
  let analyzer: Analyzer | undefined;
  let analyzerResults: ReturnType<typeof createAnalysisStore> | undefined;
  if (config.run_analyzer) {
    // Its own connection: its transactions never interleave with the API's writes.
    const db = openResultsDb(config.analyzer.results_path);
    analyzerResults = createAnalysisStore(db);
    const wf = createWorkflowStore(db);
    analyzer = createAnalyzer(
      {
        samples,
        results: analyzerResults,
        fleet: () => fleet.current().models,
        extraMaintenance: (v) => wf.maintenance(v).map((m) => m.entry),
        clock,
        log,
      },
      { poll_ms: config.analyzer.poll_ms },
    );
    analyzer.start();
  }
  const app = createApi({
    samples,
    results,
    workflow,
    fleet,
    tokens: new TokenRegistry(configured, workflow),
    ...(analyzer ? { analyzer } : {}),
    clock,
    log,
    web_dist: config.web_dist,
    cors_origins: config.cors_origins,
    rate_limit: config.rate_limit,
  });
  const server = serve({ fetch: app.fetch, port: options.port ?? config.port, hostname: config.host });
  await new Promise<void>((resolve, reject) => {
    server.once('listening', resolve);
    server.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://${config.host}:${port}`,
    port,
    analyzer,
    async close() {
      await analyzer?.stop();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        (server as unknown as { closeAllConnections?: () => void }).closeAllConnections?.();
      });
      await analyzerResults?.close();
      await results.close();
      await samples.close();
    },
  };
}
