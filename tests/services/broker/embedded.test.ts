import { join } from 'node:path';
import { type EmbeddedBroker, startEmbeddedBroker } from '@thermargin/broker';
import { ENV } from '@thermargin/ingester/config';
import { sampleTopic } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  connectAs,
  expectedTotals,
  fleetStream,
  fleetUsers,
  oneSample,
  publishStream,
  startFleetIngester,
  tempDir,
  waitForCount,
} from '../ingester/support.ts';

const IDS = ['bus-01', 'bus-02'];
const dir = tempDir('embedded');
let broker: EmbeddedBroker;
beforeAll(async () => {
  broker = await startEmbeddedBroker({ users: fleetUsers(IDS) });
});
afterAll(async () => {
  await broker?.close();
});

describe('embedded broker (aedes, MQTT 3.1.1) with the same auth and ACL', () => {
  it('refuses bad credentials', async () => {
    await expect(
      connectAs(
        broker.url,
        { username: 'bus-01', password: 'wrong', role: 'vehicle' },
        { reconnectPeriod: 0 },
      ),
    ).rejects.toThrow();
  });

  it("carries a stream to the ingester (protocol 4, plain subscription) exactly once; another vehicle's topic is refused", async () => {
    const store = createSqliteStore({ path: join(dir, 'embedded.db') });
    const ingester = await startFleetIngester({
      mqtt_url: broker.url,
      dir,
      ids: IDS,
      client_id: 'emb',
      share_group: '',
      store,
      env: { [ENV.MQTT_PROTOCOL]: '4', [ENV.CONNECTIONS]: '1' },
    });

    // bus-01 trying bus-02's topic: aedes refuses the publish (and, in MQTT 3.1.1, drops the connection).
    const intruder = await connectAs(broker.url, 'bus-01', { reconnectPeriod: 0 });
    const sample = oneSample('bus-02');
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
