import { join } from 'node:path';
import { sampleTopic } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type MosquittoServer, startMosquitto } from '../../support/servers/mosquitto.ts';
import { readIngesterConfig } from '@thermargin/ingester/config';
import { createIngester } from '@thermargin/ingester/ingester';
import {
  connectAs,
  ingesterEnv,
  fleetUsers,
  oneSample,
  sleep,
  startFleetIngester,
  streamUnderTakeover,
  tempDir,
} from './support.ts';

const IDS = ['bus-01', 'bus-02'];
const dir = tempDir('acl');
let broker: MosquittoServer;
beforeAll(async () => {
  broker = await startMosquitto(fleetUsers(IDS));
});
afterAll(async () => {
  await broker?.close();
});

/** Vehicles log in on the vehicles' listener, the ingester on its own. */
const connect = (id: string) =>
  connectAs(id === 'ingester' ? broker.ingester_url : broker.url, id, {
    protocolVersion: 5,
    reconnectPeriod: 0,
  });

describe('Mosquitto per-vehicle ACL (shipped rules, real broker)', () => {
  it("a vehicle publishing to another vehicle's topic is refused and nothing is stored", async () => {
    const store = createSqliteStore({ path: join(dir, 'acl.db') });
    const ingester = await startFleetIngester({
      mqtt_url: broker.ingester_url,
      dir,
      ids: IDS,
      client_id: 'acl',
      share_group: 'acl',
      store,
    });
    const intruder = await connect('bus-01');
    const forged = oneSample('bus-02');
    await expect(
      intruder.publishAsync(sampleTopic('bus-02'), JSON.stringify(forged), { qos: 1 }),
    ).rejects.toMatchObject({
      code: 135, // MQTT 5 PUBACK reason "Not authorized"
    });
    await intruder.endAsync(true);
    const own = { ...forged, vehicle: 'bus-01' };
    const honest = await connect('bus-01');
    await honest.publishAsync(sampleTopic('bus-01'), JSON.stringify(own), { qos: 1 });
    const deadline = Date.now() + 10_000;
    while (ingester.metrics.messages_acked < 1 && Date.now() < deadline) await sleep(50);
    await sleep(300);
    expect(ingester.metrics.messages_received).toBe(1);
    expect((await store.readSamples('bus-02', 0, 8.64e15)).n).toBe(0);
    expect((await store.readSamples('bus-01', 0, 8.64e15)).n).toBe(1);
    await honest.endAsync();
    await ingester.stop();
    await store.close();
  });

  it('a vehicle may not subscribe; the ingester may not publish; a wrong password is refused', async () => {
    const vehicle = await connect('bus-01');
    const granted = await vehicle.subscribeAsync('thermargin/v1/vehicles/+/samples', { qos: 1 });
    // Mosquitto grants the subscription but delivers nothing the ACL does not allow: check by delivery.
    const received: string[] = [];
    vehicle.on('message', (t) => received.push(t));
    const ingester = await connect('ingester');
    await expect(ingester.publishAsync(sampleTopic('bus-02'), '{}', { qos: 1 })).rejects.toMatchObject({
      code: 135,
    });
    const other = await connect('bus-02');
    await other.publishAsync(sampleTopic('bus-02'), '{}', { qos: 1 });
    await sleep(300);
    expect(received).toEqual([]);
    expect(granted.length).toBe(1);
    await Promise.all([vehicle.endAsync(), ingester.endAsync(), other.endAsync()]);
    await expect(
      connectAs(
        broker.url,
        { username: 'bus-01', password: 'wrong', role: 'vehicle' },
        { protocolVersion: 5, reconnectPeriod: 0 },
      ),
    ).rejects.toThrow();
  });

  it('the ingester refuses a client id that is a vehicle id of its fleet', () => {
    const env = ingesterEnv({
      mqtt_url: broker.ingester_url,
      fleet_file: 'unused.json',
      client_id: 'van',
      spool_dir: join(dir, 'spool-reserved'),
    });
    const store = createSqliteStore({ path: ':memory:' });
    const create = () =>
      createIngester(
        { ...readIngesterConfig(env), metrics_port: -1 },
        { store, known_vehicles: new Set(['van-2']) },
      );
    expect(create).toThrow(/client id van-2 is a vehicle id/);
  });

  it("binds client ids to user names (shipped config): a vehicle cannot take the ingester's session", async () => {
    const r = await streamUnderTakeover({
      vehicle_url: broker.url,
      ingester_url: broker.ingester_url,
      dir,
      protocol: 5,
      share_group: 'takeover',
    });
    expect(r.kicks).toBe(0);
    expect(r.stored).toEqual(r.sent);
    // Nor on the ingesters' listener: vehicles have no login there.
    await expect(
      connectAs(broker.ingester_url, 'bus-02', {
        clientId: 'takeover-0',
        protocolVersion: 5,
        reconnectPeriod: 0,
      }),
    ).rejects.toThrow();
  });
});
