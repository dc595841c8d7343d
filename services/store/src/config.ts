import { type Env, envReader } from '@thermargin/shared/env';
import { createInfluxStore, type InfluxStoreOptions } from './influx.ts';
import { createSqliteStore, type SqliteStoreOptions } from './sqlite.ts';
import type { SampleStore } from './store.ts';

/**
 * The environment variables that say where samples and results are kept: the one list, read by every
 * service that opens the stores (ingester, API with its analyzer, CLI). Each default is defined once,
 * in the readers below.
 */
export const STORE_ENV = {
  KIND: 'STORE_KIND',
  SQLITE_PATH: 'STORE_SQLITE_PATH',
  SQLITE_SYNCHRONOUS: 'STORE_SQLITE_SYNCHRONOUS',
  INFLUX_URL: 'STORE_INFLUX_URL',
  INFLUX_API: 'STORE_INFLUX_API',
  INFLUX_ORG: 'STORE_INFLUX_ORG',
  INFLUX_BUCKET: 'STORE_INFLUX_BUCKET',
  INFLUX_TOKEN: 'STORE_INFLUX_TOKEN',
  INFLUX_DATABASE: 'STORE_INFLUX_DATABASE',
  INFLUX_RETENTION_POLICY: 'STORE_INFLUX_RETENTION_POLICY',
  INFLUX_USERNAME: 'STORE_INFLUX_USERNAME',
  INFLUX_PASSWORD: 'STORE_INFLUX_PASSWORD',
  RESULTS_PATH: 'RESULTS_SQLITE_PATH',
} as const;

/** Which sample-store adapter and its options: what STORE_* resolves to. */
export type StoreConfig =
  | ({ kind: 'sqlite' } & SqliteStoreOptions)
  | ({ kind: 'influx' } & InfluxStoreOptions);

/** The sample store STORE_* names; a bad or missing variable is added to `problems`. */
export function readStoreConfig(env: Env, problems: string[]): StoreConfig {
  const { str, oneOf } = envReader(env, problems);
  const kind = oneOf(STORE_ENV.KIND, ['sqlite', 'influx'] as const, 'sqlite');
  if (kind === 'sqlite')
    return {
      kind,
      path: str(STORE_ENV.SQLITE_PATH, 'data/thermargin.db'),
      synchronous: oneOf(STORE_ENV.SQLITE_SYNCHRONOUS, ['full', 'normal'] as const, 'full'),
    };
  const api = oneOf(STORE_ENV.INFLUX_API, ['v2', 'v1'] as const, 'v2');
  const url = str(STORE_ENV.INFLUX_URL, 'http://127.0.0.1:8086');
  if (api === 'v2')
    return {
      kind: 'influx',
      api,
      url,
      org: str(STORE_ENV.INFLUX_ORG),
      bucket: str(STORE_ENV.INFLUX_BUCKET),
      token: str(STORE_ENV.INFLUX_TOKEN),
    };
  return {
    kind: 'influx',
    api,
    url,
    database: str(STORE_ENV.INFLUX_DATABASE),
    retention_policy: str(STORE_ENV.INFLUX_RETENTION_POLICY, ''),
    username: str(STORE_ENV.INFLUX_USERNAME, '') || undefined,
    password: str(STORE_ENV.INFLUX_PASSWORD, '') || undefined,
  };
}

/**
 * The results database (SQLite: trip results, watermarks, the API's records): RESULTS_SQLITE_PATH, by
 * default the SQLite sample store's own file, or `data/results.db` beside an InfluxDB store.
 */
export function readResultsPath(env: Env, samples: StoreConfig): string {
  return (
    env[STORE_ENV.RESULTS_PATH] ||
    (samples.kind === 'sqlite' && samples.path !== ':memory:' ? samples.path : 'data/results.db')
  );
}

export function openSampleStore(config: StoreConfig): SampleStore {
  const { kind, ...options } = config;
  return kind === 'sqlite'
    ? createSqliteStore(options as SqliteStoreOptions)
    : createInfluxStore(options as InfluxStoreOptions);
}
