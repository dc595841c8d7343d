import { DecodePool } from '@thermargin/ingester/decode-pool';
import { type Decoded, safeDecode } from '@thermargin/ingester/decode';
import { vehicleReadings } from '@thermargin/ingester/vehicle-readings';
import { encodeFrameBatch, encodeSamplePayload, frameTopic, sampleTopic, toSample } from '@thermargin/shared';
import { DEMO_FRAME_MAPS, sampleFrames } from '../../../services/simulator/src/frames.ts';
import { afterAll, describe, expect, it } from 'vitest';
import { hostileCorpus } from './corpus.ts';
import { fleetStream } from './support.ts';

const IDS = ['bus-01', 'bus-02'];
const ctx = { known_vehicles: new Set(IDS), max_payload_bytes: 1 << 20 };
const now_ms = Date.UTC(2025, 6, 3);
const events: string[] = [];
const pool = new DecodePool(2, ctx, (event, detail) => events.push(`${event} ${JSON.stringify(detail)}`));
afterAll(() => pool.close());

describe('DecodePool (decoding on worker threads)', () => {
  it('gives exactly what decoding on the main thread gives, for good batches and hostile payloads', async () => {
    const [stream = []] = fleetStream(['bus-01'], 1200);
    const messages = [
      ...[0, 400, 800].map((i) => ({
        topic: sampleTopic('bus-01'),
        payload: Buffer.from(encodeSamplePayload(stream.slice(i, i + 400))),
      })),
      ...hostileCorpus('bus-01', 'bus-02', 'ghost-09').map((m) => ({
        topic: sampleTopic(m.topic_vehicle),
        payload: Buffer.from(m.payload),
      })),
    ];
    const viaPool = await Promise.all(messages.map((m) => pool.decode(m.topic, m.payload, now_ms)));
    const inline = messages.map((m) => safeDecode(m.topic, m.payload, { ...ctx, now_ms }));
    // Whether a deeply nested structure can be serialised for its excerpt depends on the thread's stack size.
    const tooDeep = (d: Decoded) => d.rejects.some((r) => r.excerpt.includes('not serialisable'));
    const excerptAside = (d: Decoded, i: number) =>
      tooDeep(inline[i]!) ? { ...d, rejects: d.rejects.map((r) => ({ ...r, excerpt: '' })) } : d;
    expect(viaPool.map(excerptAside)).toEqual(inline.map(excerptAside));
    expect(viaPool.slice(0, 3).flatMap((d) => d.samples)).toHaveLength(1200);
    expect(events).toEqual([]); // both workers loaded and stayed up: nothing fell back inline
  });

  it('decodes a payload that is a slice of a larger buffer from its own bytes only', async () => {
    const [stream = []] = fleetStream(['bus-02'], 3);
    const text = encodeSamplePayload(stream);
    const big = Buffer.from(`garbage${text}garbage`);
    const d = await pool.decode(sampleTopic('bus-02'), big.subarray(7, 7 + text.length), now_ms);
    expect(d.rejects).toEqual([]);
    expect(d.samples.map((s) => s.time_ms)).toEqual(stream.map((w) => w.time));
  });
});

describe('DecodePool with frames', () => {
  it('decodes frames messages on the workers with the vehicles’ mappings, as the main thread does', async () => {
    const maps = new Map([['bus-01', { map: DEMO_FRAME_MAPS.electric, reference_torque_nm: null }]]);
    const framed = { ...ctx, readings: vehicleReadings(maps) };
    const withMaps = new DecodePool(1, framed, () => {}, maps);
    const [stream = []] = fleetStream(['bus-01'], 300);
    const payload = Buffer.from(encodeFrameBatch(stream.flatMap((w) => sampleFrames(toSample(w), false))));
    const cut = payload.subarray(0, payload.length - 5);
    for (const p of [payload, cut]) {
      const viaPool = await withMaps.decode(frameTopic('bus-01'), p, now_ms);
      expect(viaPool).toEqual(safeDecode(frameTopic('bus-01'), p, { ...framed, now_ms }));
    }
    const whole = await withMaps.decode(frameTopic('bus-01'), payload, now_ms);
    expect(whole.samples).toHaveLength(300);
    expect(whole.tallies[0]).toMatchObject({ vehicle: 'bus-01', samples: 300, incomplete: 0 });
    await withMaps.close();
  });
});
