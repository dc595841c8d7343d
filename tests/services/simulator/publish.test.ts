import { parseSampleTopic, SAMPLE_TOPIC_FILTER, wireSampleSchema } from '@thermargin/shared';
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type EmbeddedBroker, startEmbeddedBroker } from '../../../services/broker/src/index.ts';
import { publishScenario } from '../../../services/simulator/src/publish.ts';
import { createScenario } from '../../../services/simulator/src/scenario.ts';

// a real broker (the embedded one, with the project's ACL: a vehicle may publish only its own topic)
let broker: EmbeddedBroker;
const users = [
  { username: 'bus-01', password: 'pw-bus-01', role: 'vehicle' as const },
  { username: 'bus-02', password: 'pw-bus-02', role: 'vehicle' as const },
  { username: 'reader', password: 'pw-reader', role: 'ingester' as const },
];
beforeAll(async () => {
  broker = await startEmbeddedBroker({ users });
});
afterAll(async () => {
  await broker?.close();
});

describe('publishScenario', () => {
  it('publishes QoS 1 batches on each vehicle topic with its own credentials', async () => {
    const sc = createScenario({ days: 1, vehicles: 2 });
    const first = (id: string) => [...sc.vehicleSamples(id)][0]!.time_ms;
    const from_ms = Math.max(first('bus-01'), first('bus-02')); // both on the road
    const range = { from_ms, to_ms: from_ms + 600_000 };
    const expected = [...sc.fleetSamples(range)];

    const reader = await mqtt.connectAsync(broker.url, {
      username: 'reader',
      password: 'pw-reader',
      protocolVersion: 4,
      // the embedded broker acknowledges a vehicle once a receiver with a persistent session has
      clientId: 'reader',
      clean: false,
    });
    const got = new Map<string, number>();
    let invalid = 0;
    let batches = 0;
    reader.on('message', (topic, payload) => {
      const vehicle = parseSampleTopic(topic)!;
      const batch = JSON.parse(payload.toString()) as unknown[];
      batches++;
      for (const w of batch) {
        const p = wireSampleSchema.safeParse(w);
        if (!p.success || p.data.vehicle !== vehicle) invalid++;
        got.set(vehicle, (got.get(vehicle) ?? 0) + 1);
      }
    });
    await reader.subscribeAsync(SAMPLE_TOPIC_FILTER, { qos: 1 });

    const result = await publishScenario(null, sc, {
      range,
      batch_size: 250,
      url: broker.url,
      credentials: (v) => {
        const u = users.find((x) => x.username === v);
        return u && { username: u.username, password: u.password };
      },
    });
    expect(result.samples).toBe(expected.length);
    const deadline = Date.now() + 5000;
    while ([...got.values()].reduce((a, b) => a + b, 0) < expected.length && Date.now() < deadline)
      await new Promise((r) => setTimeout(r, 20));
    await reader.endAsync();
    expect(invalid).toBe(0);
    expect(batches).toBe(result.messages);
    for (const v of ['bus-01', 'bus-02']) {
      expect(expected.filter((s) => s.vehicle === v).length).toBeGreaterThan(0);
      expect(got.get(v)).toBe(expected.filter((s) => s.vehicle === v).length);
    }
  });

  it('refuses a batch size the ingester would reject', async () => {
    await expect(
      publishScenario(null, createScenario({ days: 1, vehicles: 1 }), { batch_size: 20_000 }),
    ).rejects.toThrow(/batch_size/);
  });
});
