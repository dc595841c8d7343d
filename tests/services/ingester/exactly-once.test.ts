import { join } from 'node:path';
import { ENV } from '@thermargin/ingester/config';
import { type SampleStore, createInfluxStore, createSqliteStore } from '@thermargin/store';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type InfluxServer, startInflux } from '../../support/servers/influx.ts';
import { type MosquittoServer, startMosquitto } from '../../support/servers/mosquitto.ts';
import {
  expectedTotals,
  fleetStream,
  fleetUsers,
  publishStream,
  startFleetIngester,
  tempDir,
  waitForCount,
} from './support.ts';

const IDS = ['bus-01', 'bus-02', 'van-03', 'truck-04'];
let broker: MosquittoServer;
let influx: InfluxServer;
const dir = tempDir('exactly-once');

beforeAll(async () => {
  [broker, influx] = await Promise.all([startMosquitto(fleetUsers(IDS)), startInflux()]);
  await influx.createDatabase('once');
});
afterAll(async () => {
  await Promise.all([broker?.close(), influx?.close()]);
});

async function runThrough(store: SampleStore, name: string, env: Record<string, string> = {}) {
  const ingester = await startFleetIngester({
    mqtt_url: broker.ingester_url,
    dir,
    ids: IDS,
    client_id: `once-${name}`,
    // One group per run: a stopped run's sessions stay members of its group (see the ingester README).
    share_group: `once-${name}`,
    spool: name,
    store,
    env,
  });
  const stream = fleetStream(IDS, 2500);
  await publishStream(broker.url, stream, 50);
  const want = expectedTotals(stream);
  const got = await waitForCount(store, IDS, want.count);
  await ingester.stop();
  return { want, got, metrics: ingester.metrics };
}

describe('every sample of a fleet stream arrives exactly once (real Mosquitto)', () => {
  it('into SQLite', async () => {
    const store = createSqliteStore({ path: join(dir, 'once.db') });
    const { want, got, metrics } = await runThrough(store, 'sqlite');
    expect(got).toEqual(want);
    expect(metrics.samples_received).toBe(want.count);
    expect(metrics.rejected_total).toBe(0);
    await store.close();
  });

  it('into SQLite, decoded on worker threads', async () => {
    const store = createSqliteStore({ path: join(dir, 'once-workers.db') });
    const { want, got, metrics } = await runThrough(store, 'workers', { [ENV.DECODE_WORKERS]: '2' });
    expect(got).toEqual(want);
    expect(metrics.samples_received).toBe(want.count);
    expect(metrics.rejected_total).toBe(0);
    await store.close();
  });

  it('into InfluxDB (real influxd 1.6, 1.x API)', async () => {
    const store = createInfluxStore({ url: influx.url, api: 'v1', database: 'once' });
    const { want, got, metrics } = await runThrough(store, 'influx');
    expect(got.count).toBe(want.count);
    expect(got.power_sum).toBeCloseTo(want.power_sum, 6);
    expect(metrics.samples_received).toBe(want.count);
    await store.close();
  });
});
