import { appendFileSync, renameSync, truncateSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ENV } from '@thermargin/ingester/config';
import { followMosquittoLog, mosquittoRefusal } from '@thermargin/ingester/mosquitto-log';
import { type BrokerRefusal, sampleTopic } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type MosquittoServer, startMosquitto } from '../../support/servers/mosquitto.ts';
import { connectAs, fleetUsers, oneSample, sleep, startFleetIngester, tempDir } from './support.ts';

const IDS = ['bus-01', 'bus-02'];
const dir = tempDir('broker-refusals');

describe("Mosquitto's refusals, read from its log", () => {
  // Lines as Mosquitto 2.0.11 writes them (log_type notice and debug).
  it('reads a refused login, with the address when the client is unknown, and a denied publish', () => {
    expect(
      mosquittoRefusal(
        '1796392007: Client <unknown> disconnected, not authorised.',
        '1796392007: Sending CONNACK to 127.0.0.1 (0, 5)',
      ),
    ).toEqual({
      time_ms: 1796392007000,
      client_id: '',
      username: '',
      reason: 'broker_login',
      topic: '',
      detail: 'wrong user name or password (from 127.0.0.1)',
    });
    expect(mosquittoRefusal('1796392008: Client auto-19EC disconnected, not authorised.')).toMatchObject({
      client_id: 'auto-19EC',
      reason: 'broker_login',
    });
    expect(
      mosquittoRefusal(
        "1796392007: Denied PUBLISH from bus-01 (d0, q1, r0, m1, 'thermargin/v1/vehicles/bus-02/samples', ... (1 bytes))",
      ),
    ).toMatchObject({
      client_id: 'bus-01',
      username: 'bus-01',
      reason: 'broker_denied',
      topic: 'thermargin/v1/vehicles/bus-02/samples',
    });
    for (const other of [
      '1796392007: Client bus-01 disconnected.',
      "1796392007: Received PUBLISH from bus-01 (d0, q1, r0, m1, 'thermargin/v1/vehicles/bus-01/samples', ... (9 bytes))",
      '1796392007: New connection from 127.0.0.1:60130 on port 18931.',
    ])
      expect(mosquittoRefusal(other)).toBeUndefined();
  });

  it('follows the file from its end, through a truncation and a rotation', async () => {
    const file = join(dir, 'follow.log');
    const denied = (id: string) =>
      `1: Denied PUBLISH from ${id} (d0, q1, r0, m1, '${sampleTopic('bus-02')}', ... (1 bytes))\n`;
    writeFileSync(file, denied('before-start'));
    const seen: BrokerRefusal[] = [];
    const follower = followMosquittoLog(file, (r) => seen.push(r));
    await follower.poll();
    appendFileSync(file, denied('a'));
    appendFileSync(file, denied('b').slice(0, 20)); // half a line: read once whole
    await follower.poll();
    appendFileSync(file, denied('b').slice(20));
    await follower.poll();
    truncateSync(file, 0);
    await follower.poll();
    appendFileSync(file, denied('c'));
    await follower.poll();
    renameSync(file, `${file}.1`);
    writeFileSync(file, denied('d'));
    await follower.close();
    expect(seen.map((r) => r.client_id)).toEqual(['a', 'b', 'c', 'd']);
  });
});

describe('Mosquitto (shipped config, real broker): refusals counted beside refused messages', () => {
  let broker: MosquittoServer;
  beforeAll(async () => {
    broker = await startMosquitto(fleetUsers(IDS));
  });
  afterAll(async () => {
    await broker?.close();
  });

  it("a wrong password and another vehicle's topic are counted per reason, naming the client", async () => {
    const store = createSqliteStore({ path: join(dir, 'refusals.db') });
    const ingester = await startFleetIngester({
      mqtt_url: broker.ingester_url,
      dir,
      ids: IDS,
      client_id: 'refusals',
      share_group: 'refusals',
      store,
      env: { [ENV.BROKER_LOG]: broker.log_file },
    });
    const opts = { protocolVersion: 5, reconnectPeriod: 0 } as const;
    await expect(
      connectAs(broker.url, { username: 'bus-01', password: 'wrong', role: 'vehicle' }, opts),
    ).rejects.toThrow();
    const intruder = await connectAs(broker.url, 'bus-01', opts);
    await expect(
      intruder.publishAsync(sampleTopic('bus-02'), JSON.stringify(oneSample('bus-02')), { qos: 1 }),
    ).rejects.toMatchObject({ code: 135 });
    await intruder.endAsync();

    const counted = async () =>
      (await store.countDeadLetters()).filter((c) => c.reason.startsWith('broker_'));
    const deadline = Date.now() + 15_000;
    while ((await counted()).length < 2 && Date.now() < deadline) await sleep(200);
    expect((await counted()).sort((a, b) => a.reason.localeCompare(b.reason))).toEqual([
      { vehicle: 'bus-01', reason: 'broker_denied', count: 1 },
      // Mosquitto names neither the user nor the client id of a refused login: its address only.
      { vehicle: '', reason: 'broker_login', count: 1 },
    ]);
    const [login] = await store.readDeadLetters({ reason: 'broker_login' });
    expect(login!.detail).toBe('client id (none): wrong user name or password (from 127.0.0.1)');
    const [denied] = await store.readDeadLetters({ reason: 'broker_denied' });
    expect(denied).toMatchObject({
      topic: sampleTopic('bus-02'),
      detail: 'client id bus-01, user bus-01: publish outside its topics',
    });
    await ingester.stop();
    await store.close();
  });
});
