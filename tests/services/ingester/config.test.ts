import { DEFAULT_CONNECTIONS, ENV, readIngesterConfig } from '@thermargin/ingester/config';
import { STORE_ENV } from '@thermargin/store/config';
import { describe, expect, it } from 'vitest';

// docker-compose.yml's ingesters are checked with the rest of it in tests/deploy/compose.test.ts.
describe('readIngesterConfig', () => {
  it('defaults to SQLite and MQTT 5 with a shared subscription', () => {
    const c = readIngesterConfig({ [ENV.FLEET_FILE]: 'fleet.json' });
    expect(c.store).toEqual({ kind: 'sqlite', path: 'data/thermargin.db', synchronous: 'full' });
    expect(c.mqtt).toMatchObject({ protocol: 5, share_group: 'ingesters', connections: DEFAULT_CONNECTIONS });
  });
  it('names every bad variable', () => {
    const bad = () =>
      readIngesterConfig({ [ENV.CONNECTIONS]: 'many', [STORE_ENV.KIND]: 'mongo', [ENV.MQTT_PROTOCOL]: '4' });
    for (const rule of [
      /INGEST_CONNECTIONS must be an integer ≥ 1 \(got "many"\)/,
      /STORE_KIND must be one of sqlite, influx/,
      /INGEST_FLEET_FILE is required/,
      /INGEST_SHARE_GROUP needs INGEST_MQTT_PROTOCOL=5/,
    ]) {
      expect(bad).toThrow(rule);
    }
  });
});
