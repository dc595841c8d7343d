import { join } from 'node:path';
import { decodeMessage } from '@thermargin/ingester/decode';
import { REJECT_REASONS, sampleTopic, toWire } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type MosquittoServer, startMosquitto } from '../../support/servers/mosquitto.ts';
import { hostileCorpus } from './corpus.ts';
import { connectAs, fleetUsers, sleep, startFleetIngester, tempDir } from './support.ts';

const IDS = ['bus-01', 'bus-02'];
const GHOST = 'ghost-09'; // has broker credentials, absent from the fleet file
const dir = tempDir('bad-input');
let broker: MosquittoServer;
beforeAll(async () => {
  broker = await startMosquitto(fleetUsers([...IDS, GHOST]));
});
afterAll(async () => {
  await broker?.close();
});

const validSample = (vehicle: string, i: number) => ({
  time: Date.UTC(2025, 6, 2) + i * 1000,
  vehicle,
  speed_kmh: i % 100,
  power_kw: 10 + i,
  coolant_in_c: 80,
  ambient_c: 20,
  fan_pct: 30,
});

describe('bad input never stops the ingester; each is dead-lettered with its reason', () => {
  it('a corpus of ≥ 1 000 hostile messages interleaved with valid ones (real Mosquitto, SQLite)', async () => {
    const store = createSqliteStore({ path: join(dir, 'bad.db') });
    const ingester = await startFleetIngester({
      mqtt_url: broker.ingester_url,
      dir,
      ids: IDS,
      client_id: 'bad',
      share_group: 'bad',
      store,
    });
    const corpus = hostileCorpus('bus-01', 'bus-02', GHOST);
    expect(corpus.length).toBeGreaterThanOrEqual(1000);
    const pubs = new Map(
      await Promise.all(
        [...IDS, GHOST].map(
          async (id) => [id, await connectAs(broker.url, id, { protocolVersion: 5 })] as const,
        ),
      ),
    );
    let valid = 0;
    for (const [i, bad] of corpus.entries()) {
      await pubs.get(bad.publisher)!.publishAsync(sampleTopic(bad.topic_vehicle), bad.payload, { qos: 1 });
      await pubs
        .get('bus-02')!
        .publishAsync(sampleTopic('bus-02'), JSON.stringify(validSample('bus-02', i)), { qos: 1 });
      valid++;
    }
    const deadline = Date.now() + 30_000;
    while (ingester.metrics.messages_acked < corpus.length + valid && Date.now() < deadline) await sleep(100);
    await ingester.stop();

    const stored = await store.readSamples('bus-02', 0, 8.64e15);
    expect(stored.n).toBe(valid);
    expect((await store.readSamples('bus-01', 0, 8.64e15)).n).toBe(0);
    const counts = await store.countDeadLetters();
    const byReason: Record<string, number> = {};
    for (const c of counts) byReason[c.reason] = (byReason[c.reason] ?? 0) + c.count;
    const want: Record<string, number> = {};
    for (const b of corpus) want[b.reason] = (want[b.reason] ?? 0) + 1;
    console.log(
      `[bad-input] ${corpus.length} hostile, ${valid} valid; dead letters by reason ${JSON.stringify(byReason)}`,
    );
    expect(byReason).toEqual(want);
    expect(ingester.metrics.rejected_total).toBe(corpus.length);
    const letters = await store.readDeadLetters({ limit: 5000 });
    expect(letters.every((l) => REJECT_REASONS.includes(l.reason) && l.detail.length > 0)).toBe(true);
    expect(Math.max(...letters.map((l) => Buffer.byteLength(l.excerpt)))).toBeLessThanOrEqual(2048);
    await Promise.all([...pubs.values()].map((c) => c.endAsync()));
    await store.close();
  });

  it('a message of 10 000 bad samples is one dead letter with the count and the first reasons', async () => {
    const store = createSqliteStore({ path: join(dir, 'one-letter.db') });
    const ingester = await startFleetIngester({
      mqtt_url: broker.ingester_url,
      dir,
      ids: IDS,
      client_id: 'one-letter',
      share_group: 'one-letter',
      store,
    });
    // ≈ 20 KB: 9 999 items that are no sample at all, one sample with a value out of range.
    const batch: unknown[] = Array.from({ length: 10_000 }, () => 0);
    batch[7] = { ...validSample('bus-01', 7), fan_pct: 101 };
    const pub = await connectAs(broker.url, 'bus-01', { protocolVersion: 5 });
    await pub.publishAsync(sampleTopic('bus-01'), JSON.stringify(batch), { qos: 1 });
    const deadline = Date.now() + 30_000;
    while (ingester.metrics.messages_acked < 1 && Date.now() < deadline) await sleep(50);
    await ingester.stop();
    const letters = await store.readDeadLetters({ limit: 20_000 });
    expect(letters).toHaveLength(1);
    expect(letters[0]!.reason).toBe('schema');
    expect(letters[0]!.detail).toMatch(
      /^10000 of 10000 samples refused \(schema 9999, range 1\); first 3: samples\[0\]: .+; samples\[1\]: .+; samples\[2\]: /,
    );
    expect(ingester.metrics.rejections()).toEqual([
      { vehicle: 'bus-01', reason: 'schema', count: 9999 },
      { vehicle: 'bus-01', reason: 'range', count: 1 },
    ]);
    await pub.endAsync();
    await store.close();
  });
});

describe('decodeMessage property-based (fast-check)', () => {
  const ctx = { known_vehicles: new Set(IDS), now_ms: Date.UTC(2025, 6, 3), max_payload_bytes: 1 << 20 };
  const topic = sampleTopic('bus-01');

  it('never throws, and accounts for every item: stored + dead-lettered = items', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        const d = decodeMessage(topic, Buffer.from(JSON.stringify(value) ?? ''), ctx);
        const items = Array.isArray(value) && value.length > 0 ? value.length : 1;
        const refused = Object.values(d.refused).reduce((n, c) => n + c, 0);
        expect(d.samples.length + refused).toBe(items);
        expect(d.rejects.length).toBe(refused > 0 ? 1 : 0); // one letter per message
        for (const r of d.rejects) expect(REJECT_REASONS).toContain(r.reason);
      }),
      { numRuns: 2000, seed: 42 },
    );
  });

  it('in a batch of valid samples with random fields broken, exactly the broken ones are refused', () => {
    const breakage = fc.constantFrom<[string, unknown]>(
      ['speed_kmh', -1],
      ['fan_pct', 'x'],
      ['ambient_c', 1e9],
      ['vehicle', 'bus-02'],
      ['time', 0],
      ['bogus', 1],
      ['coolant_in_c', null],
    );
    fc.assert(
      fc.property(
        fc.array(fc.option(breakage, { nil: undefined }), { minLength: 1, maxLength: 50 }),
        (plan) => {
          const batch = plan.map((b, i) => {
            const s: Record<string, unknown> = toWire({
              ...validSample('bus-01', i),
              time_ms: Date.UTC(2025, 6, 2) + i * 1000,
            } as never);
            delete s.time_ms;
            s.time = Date.UTC(2025, 6, 2) + i * 1000;
            if (b) s[b[0]] = b[1];
            return s;
          });
          const d = decodeMessage(topic, Buffer.from(JSON.stringify(batch)), ctx);
          expect(Object.values(d.refused).reduce((n, c) => n + c, 0)).toBe(plan.filter(Boolean).length);
          expect(d.samples.length).toBe(plan.filter((b) => !b).length);
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });
});
