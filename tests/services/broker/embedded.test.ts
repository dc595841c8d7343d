import { join } from 'node:path';
import { type EmbeddedBroker, startEmbeddedBroker } from '@thermargin/broker';
import { ENV, readIngesterConfig } from '@thermargin/ingester/config';
import { createIngester } from '@thermargin/ingester/ingester';
import { sampleTopic } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  INGESTER_USER,
  expectedTotals,
  fleetStream,
  ingesterEnv,
  publishStream,
  tempDir,
  vehicleUser,
  waitForCount,
  writeFleetFile,
} from '../ingester/support.ts';

const IDS = ['bus-01', 'bus-02'];
const dir = tempDir('embedded');
let broker: EmbeddedBroker;
beforeAll(async () => {
  broker = await startEmbeddedBroker({ users: [INGESTER_USER, ...IDS.map(vehicleUser)] });
});
afterAll(async () => {
  await broker?.close();
});

describe('embedded broker (aedes, MQTT 3.1.1) with the same auth and ACL', () => {
  it('refuses bad credentials', async () => {
    await expect(
      mqtt.connectAsync(broker.url, { username: 'bus-01', password: 'wrong', reconnectPeriod: 0 }),
    ).rejects.toThrow();
  });

  it("carries a stream to the ingester (protocol 4, plain subscription) exactly once; another vehicle's topic is refused", async () => {
    const store = createSqliteStore({ path: join(dir, 'embedded.db') });
    const config = readIngesterConfig({
      ...ingesterEnv({
        mqtt_url: broker.url,
        fleet_file: writeFleetFile(dir, IDS),
        client_id: 'emb',
        spool_dir: join(dir, 'spool'),
        store: {},
      }),
      [ENV.MQTT_PROTOCOL]: '4',
      [ENV.SHARE_GROUP]: '',
      [ENV.CONNECTIONS]: '1',
    });
    const ingester = createIngester({ ...config, metrics_port: -1 }, { store, known_vehicles: new Set(IDS) });
    await ingester.start();

    // bus-01 trying bus-02's topic: aedes refuses the publish (and, in MQTT 3.1.1, drops the connection).
    const u = vehicleUser('bus-01');
    const intruder = await mqtt.connectAsync(broker.url, {
      username: u.username,
      password: u.password,
      reconnectPeriod: 0,
    });
    const sample = {
      time: Date.UTC(2025, 6, 1),
      vehicle: 'bus-02',
      speed_kmh: 1,
      power_kw: 1,
      coolant_in_c: 70,
      ambient_c: 20,
      fan_pct: 0,
    };
    intruder.publish(sampleTopic('bus-02'), JSON.stringify(sample), { qos: 1 });
    await new Promise((r) => setTimeout(r, 300));
    intruder.end(true);

    const stream = fleetStream(IDS, 1000);
    await publishStream(broker.url, stream, 50, undefined, 4);
    const want = expectedTotals(stream);
    expect(await waitForCount(store, IDS, want.count)).toEqual(want);
    expect((await store.readSamples('bus-02', sample.time, sample.time + 1)).n).toBe(0);
    await ingester.stop();
    await store.close();
  });
});
