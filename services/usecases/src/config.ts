import type { Env } from '@thermargin/shared/env';
import {
  type ResultsConfig,
  readResultsConfig,
  readStoreConfig,
  type StoreConfig,
} from '@thermargin/store/config';

/** The fleet file's variable; the stores' are STORE_* and RESULTS_* (services/store). */
export const DEPLOYMENT_ENV = { FLEET_FILE: 'FLEET_FILE' } as const;

/** What a deployment works on: the fleet file, the sample store and the results database. */
export interface DeploymentConfig {
  fleet_file: string;
  samples: StoreConfig;
  /** Results, watermarks and the API's records: a SQLite file (beside the samples) or PostgreSQL. */
  results: ResultsConfig;
}

/**
 * The deployment the API, its analyzer and the CLI's store commands share; each bad variable is added to
 * `problems`. FLEET_FILE falls back to the ingester's INGEST_FLEET_FILE (one file for both).
 */
export function readDeploymentConfig(env: Env, problems: string[]): DeploymentConfig {
  const fleet_file = env[DEPLOYMENT_ENV.FLEET_FILE] || env.INGEST_FLEET_FILE || '';
  if (!fleet_file) problems.push(`${DEPLOYMENT_ENV.FLEET_FILE} is required`);
  const samples = readStoreConfig(env, problems);
  return { fleet_file, samples, results: readResultsConfig(env, samples, problems) };
}

/** readDeploymentConfig, or an Error naming every bad variable. */
export function deploymentConfig(env: Env = process.env): DeploymentConfig {
  const problems: string[] = [];
  const config = readDeploymentConfig(env, problems);
  if (problems.length) throw new Error(`configuration:\n  ${problems.join('\n  ')}`);
  return config;
}
