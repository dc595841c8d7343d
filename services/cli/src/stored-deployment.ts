import { existsSync } from 'node:fs';
import { InputError } from '@thermargin/shared';
import type { Env } from '@thermargin/shared/env';
import { STORE_ENV } from '@thermargin/store/config';
import { type DeploymentConfig, DEPLOYMENT_ENV, deploymentConfig } from '@thermargin/usecases/config';

const WHAT_TO_SET =
  `set ${STORE_ENV.KIND} with ${STORE_ENV.SQLITE_PATH} (sqlite) or ${STORE_ENV.INFLUX_URL} and its ` +
  `${STORE_ENV.INFLUX_BUCKET}/${STORE_ENV.INFLUX_TOKEN} (influx), and ${STORE_ENV.RESULTS_SQLITE_PATH} ` +
  `(or ${STORE_ENV.RESULTS_KIND}=postgres with ${STORE_ENV.RESULTS_POSTGRES_URL}), as for the API and the analyzer`;

/**
 * The deployment a command reads from, refused unless its stores exist: a read never creates an empty
 * store and reports on nothing. The refusal names the files looked for and the variables that name them.
 * `option` is the flag the problems name.
 */
export function storedDeployment(option: string, env: Env, fleetPath?: string): DeploymentConfig {
  let config: DeploymentConfig;
  try {
    config = deploymentConfig(fleetPath ? { ...env, [DEPLOYMENT_ENV.FLEET_FILE]: fleetPath } : env);
  } catch (e) {
    throw new InputError([{ where: option, rule: (e as Error).message }], 'nothing to read');
  }
  // A PostgreSQL results database is a server: opening it creates nothing, so only files are checked.
  const files: [string, string][] = [];
  if (config.results.kind === 'sqlite')
    files.push([config.results.path, `results database (${STORE_ENV.RESULTS_SQLITE_PATH})`]);
  if (config.samples.kind === 'sqlite')
    files.unshift([config.samples.path, `sample store (${STORE_ENV.SQLITE_PATH})`]);
  const missing = files
    .filter(([path], i) => files.findIndex(([p]) => p === path) === i && !existsSync(path))
    .map(([path, what]) => `no ${what} at ${path}`);
  if (missing.length)
    throw new InputError(
      [
        ...missing.map((rule) => ({ where: option, rule })),
        { where: 'to read a deployment', rule: WHAT_TO_SET },
      ],
      'nothing to read',
    );
  return config;
}
