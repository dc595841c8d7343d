import { join } from 'node:path';
import { type BrokerRefusal, type EmbeddedBroker, startEmbeddedBroker } from '@thermargin/broker';
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
  storedTotals,
  streamUnderTakeover,
  tempDir,
  waitForCount,
} from '../ingester/support.ts';

const IDS = ['bus-01', 'bus-02'];
const T0 = Date.UTC(2025, 6, 1);
const dir = tempDir('embedded');
let broker: EmbeddedBroker;
const refusals: BrokerRefusal[] = [];
beforeAll(async () => {
  broker = await startEmbeddedBroker({ users: fleetUsers(IDS), onRefused: (r) => refusals.push(r) });
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
    // The tool is told, with the client id and the reason, not only the broker's log.
    expect(refusals.at(-1)).toMatchObject({
      username: 'bus-01',
      reason: 'broker_login',
      detail: 'wrong password',
    });
    expect(refusals.at(-1)!.client_id).not.toBe('');
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
    expect(refusals.at(-1)).toMatchObject({
      username: 'bus-01',
      reason: 'broker_denied',
      topic: sampleTopic('bus-02'),
    });

    const stream = fleetStream(IDS, 1000);
    await publishStream(broker.url, stream, 50, undefined, 4);
    const want = expectedTotals(stream);
    expect(await waitForCount(store, IDS, want.count)).toEqual(want);
    expect((await store.readSamples('bus-02', sample.time, sample.time + 1)).n).toBe(0);
    await ingester.stop();
    await store.close();
  });

  it("acknowledges a vehicle's QoS 1 publish only once the ingester has stored it", async () => {
    // A fresh broker: no ingester yet, so aedes alone would acknowledge and drop the message.
    const fresh = await startEmbeddedBroker({ users: fleetUsers(IDS) });
    const store = createSqliteStore({ path: join(dir, 'stored-ack.db') });
    const vehicle = await connectAs(fresh.url, 'bus-01', { protocolVersion: 4 });
    const storedWhenAcked: number[] = [];
    const publish = (i: number) =>
      vehicle
        .publishAsync(sampleTopic('bus-01'), JSON.stringify(oneSample('bus-01', T0 + i * 1000)), { qos: 1 })
        .then(async () => storedWhenAcked.push((await storedTotals(store, ['bus-01'])).count));
    const first = publish(0);
    const ingester = await startFleetIngester({
      mqtt_url: fresh.url,
      dir,
      ids: IDS,
      client_id: 'acked',
      share_group: '',
      store,
      env: { [ENV.MQTT_PROTOCOL]: '4', [ENV.CONNECTIONS]: '1' },
    });
    await first;
    for (let i = 1; i < 30; i++) await publish(i);
    expect(storedWhenAcked).toEqual(Array.from({ length: 30 }, (_, i) => i + 1));
    expect(fresh.unacknowledged).toBe(0);
    await vehicle.endAsync();
    await ingester.stop();
    await store.close();
    await fresh.close();
  });

  it("binds client ids to user names: a vehicle cannot take the ingester's session, nor the ingester a vehicle's id", async () => {
    const r = await streamUnderTakeover({
      vehicle_url: broker.url,
      ingester_url: broker.url,
      dir,
      protocol: 4,
      share_group: '',
      env: { [ENV.MQTT_PROTOCOL]: '4', [ENV.CONNECTIONS]: '1' },
    });
    expect(r.kicks).toBe(0);
    expect(r.stored).toEqual(r.sent);
    // The ingester's credentials with a vehicle's id are refused (identifier rejected).
    await expect(
      connectAs(broker.url, 'ingester', { clientId: 'bus-01', protocolVersion: 4, reconnectPeriod: 0 }),
    ).rejects.toThrow(/identifier rejected|client id/i);
    expect(refusals.at(-1)).toMatchObject({
      client_id: 'bus-01',
      username: 'ingester',
      reason: 'broker_login',
      detail: "client id bus-01 is a vehicle's",
    });
  });
});
