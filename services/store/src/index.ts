export * from './config.ts';
export * from './store.ts';
export { isStorageError, type StoreFault, StoreFaultError, storeEngine, storeFault } from './faults.ts';
export { createInfluxStore, INFLUX_DEFAULTS, type InfluxStoreOptions } from './influx.ts';
export { createSqliteStore, SQLITE_DEFAULTS, type SqliteStore, type SqliteStoreOptions } from './sqlite.ts';
