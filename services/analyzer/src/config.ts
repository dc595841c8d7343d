import { readIngesterConfig } from '@thermargin/ingester';
import type { StoreConfig } from '@thermargin/store';
import { ANALYZER_DEFAULTS } from './options.ts';

/** Environment variables of the analyzer (and the API, which opens the same results database). */
export const ANALYZER_ENV = {
  FLEET_FILE: 'FLEET_FILE',
  RESULTS_PATH: 'RESULTS_SQLITE_PATH',
  POLL_MS: 'ANALYZER_POLL_MS',
} as const;

export interface AnalyzerConfig {
  fleet_file: string;
  /** SQLite file of results, watermarks and the API's records (beside InfluxDB in an Influx deployment). */
  results_path: string;
  poll_ms: number;
  samples: StoreConfig;
}

type Env = Record<string, string | undefined>;

/** The analyzer's configuration; the sample store is read from the same STORE_* variables as the ingester's. */
export function readAnalyzerConfig(env: Env = process.env): AnalyzerConfig {
  const fleet_file = env[ANALYZER_ENV.FLEET_FILE] || env.INGEST_FLEET_FILE || '';
  const problems: string[] = [];
  if (!fleet_file) problems.push(`${ANALYZER_ENV.FLEET_FILE} is required`);
  const poll = env[ANALYZER_ENV.POLL_MS];
  const poll_ms = poll ? Number(poll) : ANALYZER_DEFAULTS.poll_ms;
  if (!Number.isInteger(poll_ms) || poll_ms < 100)
    problems.push(`${ANALYZER_ENV.POLL_MS} must be an integer ≥ 100 (got ${JSON.stringify(poll)})`);
  if (problems.length) throw new Error(`analyzer configuration:\n  ${problems.join('\n  ')}`);
  // The STORE_* variables are parsed by the ingester's reader (one parser for them).
  const samples = readIngesterConfig({ ...env, INGEST_FLEET_FILE: fleet_file }).store;
  const results_path =
    env[ANALYZER_ENV.RESULTS_PATH] ||
    (samples.kind === 'sqlite' && samples.path !== ':memory:' ? samples.path : 'data/results.db');
  return { fleet_file, results_path, poll_ms, samples };
}
