import { type InfluxStoreOptions, createInfluxStore } from './influx.ts';
import { type SqliteStoreOptions, createSqliteStore } from './sqlite.ts';
import type { SampleStore } from './store.ts';

export * from './store.ts';
export { createInfluxStore, INFLUX_DEFAULTS, type InfluxStoreOptions } from './influx.ts';
export { createSqliteStore, SQLITE_DEFAULTS, type SqliteStore, type SqliteStoreOptions } from './sqlite.ts';

/** Which adapter and its options: what a service's configuration resolves to. */
export type StoreConfig =
  | ({ kind: 'sqlite' } & SqliteStoreOptions)
  | ({ kind: 'influx' } & InfluxStoreOptions);

export function openSampleStore(config: StoreConfig): SampleStore {
  const { kind, ...options } = config;
  return kind === 'sqlite'
    ? createSqliteStore(options as SqliteStoreOptions)
    : createInfluxStore(options as InfluxStoreOptions);
}
