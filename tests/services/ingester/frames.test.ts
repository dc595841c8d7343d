import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { decodeMessage } from '@thermargin/ingester/decode';
import { createIngester } from '@thermargin/ingester/ingester';
import { readIngesterConfig } from '@thermargin/ingester/config';
import { vehicleMapSpecs, vehicleReadings } from '@thermargin/ingester/vehicle-readings';
import { j1939Id } from '@thermargin/logger-data/j1939/identifier';
import {
  CAN_EXTENDED,
  type CanFrame,
  encodeFrameBatch,
  type FleetInput,
  frameTopic,
  type Sample,
  sampleTopic,
} from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { framesFleet, sendsEngineFrames, vehicleFrames } from '../../../services/simulator/src/frames.ts';
import { publishScenario } from '../../../services/simulator/src/publish.ts';
import { createScenario } from '../../../services/simulator/src/scenario.ts';
import { type MosquittoServer, startMosquitto } from '../../support/servers/mosquitto.ts';
import { connectAs, fleetUsers, ingesterEnv, sleep, tempDir } from './support.ts';

const sc = createScenario({ seed: 2, vehicles: 6, days: 1 });
const fleet = framesFleet(sc.fleet);
const specs = (f: FleetInput) => vehicleMapSpecs(f, '');
const readings = vehicleReadings(specs(fleet));
const known = new Set(fleet.vehicles.map((v) => v.id));
const NOW = sc.history.to_ms + 3_600_000;
const decode = (topic: string, payload: Uint8Array | string) =>
  decodeMessage(topic, Buffer.from(payload), {
    known_vehicles: known,
    now_ms: NOW,
    max_payload_bytes: 1 << 20,
    readings,
  });

/** The first `n` samples of the first trip of a vehicle (bus: electric; truck: combustion engine). */
const firstSamples = (id: string, n: number) => [...sc.vehicleSamples(id)].slice(0, n);
const frames = (id: string, samples: readonly Sample[]) => [
  ...vehicleFrames(samples, sendsEngineFrames(fleet.vehicles.find((v) => v.id === id)!)),
];
const truck = fleet.vehicles.find((v) => sendsEngineFrames(v))!.id;

describe('the frames topic, decoded by the ingester', () => {
  it('rebuilds the samples of each message exactly (electric traction power; temperatures at J1939 steps)', () => {
    const samples = firstSamples('bus-01', 120);
    const d = decode(frameTopic('bus-01'), encodeFrameBatch(frames('bus-01', samples)));
    expect(d.rejects).toEqual([]);
    expect(d.samples).toEqual(samples.map(({ trip: _, ...s }) => s));
    expect(d.tallies).toEqual([
      expect.objectContaining({
        vehicle: 'bus-01',
        start_ms: samples[0]!.time_ms - 35,
        samples: 120,
        incomplete: 0,
        unknown_pgn: 0,
      }),
    ]);
    // Each sample costs its frames (6 here) at ≈ 11 bytes: the message is far smaller than the JSON.
    const bytes = encodeFrameBatch(frames('bus-01', samples)).length;
    expect(bytes / 120).toBeLessThan(6 * 12 + 1);
    expect(bytes).toBeLessThan(JSON.stringify(samples).length / 2);
  });

  it('takes engine power from EEC1 and EC1 (reassembled from its BAM), within the torque resolution', () => {
    const samples = firstSamples(truck, 120);
    const d = decode(frameTopic(truck), encodeFrameBatch(frames(truck, samples)));
    expect(d.rejects).toEqual([]);
    expect(d.samples).toHaveLength(120);
    for (const [i, s] of d.samples.entries())
      expect(Math.abs(s.power_kw - samples[i]!.power_kw)).toBeLessThan(3.3);
  });

  it('keeps the frames before a cut and dead-letters the rest as frame_layout; a broken header keeps nothing', () => {
    const samples = firstSamples('bus-01', 60);
    const whole = encodeFrameBatch(frames('bus-01', samples));
    const d = decode(frameTopic('bus-01'), whole.subarray(0, Math.floor(whole.length / 2)));
    expect(d.samples.length).toBeGreaterThan(25);
    expect(d.samples.length).toBeLessThan(31);
    expect(d.rejects).toHaveLength(1);
    expect(d.rejects[0]).toMatchObject({ reason: 'frame_layout', vehicle: 'bus-01' });
    expect(d.rejects[0]!.detail).toMatch(
      /^cut short in frame \d+: frames \d+…\d+ of \d+ unread; the \d+ before were kept$/,
    );
    const header = decode(frameTopic('bus-01'), Uint8Array.from([2, 0, 0, 0]));
    expect(header).toMatchObject({ samples: [], tallies: [] });
    expect(header.rejects[0]!.detail).toBe(
      '4 bytes: shorter than the 16-byte header: frames 0…0 of 0 unread',
    );
  });

  it('dead-letters data lengths that do not fit and clocks that go back, counts unknown PGNs and not-available values', () => {
    const samples = firstSamples('bus-01', 10);
    const f = frames('bus-01', samples);
    const t = samples[5]!.time_ms * 1000;
    const id = (pgn: number, sa = 0) => (j1939Id(6, pgn, sa) | CAN_EXTENDED) >>> 0;
    const extra: CanFrame[] = [
      { time_us: t - 500_000, id: id(65262), data: Uint8Array.from([0x78, 0xff]) }, // ET1 of 2 bytes
      { time_us: t - 400_000, id: id(65280, 0x33), data: new Uint8Array(8) }, // proprietary, not mapped
      { time_us: t - 1000, id: id(65269), data: new Uint8Array(8).fill(0xff) }, // ambient not available at t
    ];
    const all = [...f, ...extra].sort((a, b) => a.time_us - b.time_us);
    all.splice(20, 0, { ...all[19]!, time_us: all[19]!.time_us - 2_000_000 }); // a clock stepped back
    const d = decode(frameTopic('bus-01'), encodeFrameBatch(all));
    // One letter for the message, as for samples: each reason with its count, the first in words.
    expect(d.rejects.map((r) => [r.reason, r.detail])).toEqual([
      [
        'dlc_mismatch',
        'dlc_mismatch: PGN 65262 from source 0 has 2 data bytes; it needs exactly 8; ' +
          'clock_back: 1 frames earlier than the frame before them (the first is frame 20); skipped',
      ],
    ]);
    expect(d.refused).toEqual({ dlc_mismatch: 1, clock_back: 1 });
    expect(d.rejects[0]!.excerpt).toBe('18FEEE00#78ff');
    expect(d.tallies[0]).toMatchObject({ unknown_pgn: 1, not_available: 1, samples: 9, incomplete: 1 });
  });

  it('reads JSON samples with a logger’s own field names and units through the vehicle’s mapping', () => {
    const mapped = vehicleReadings([
      [
        'bus-01',
        {
          reference_torque_nm: null,
          map: {
            time: { field: 'ts', form: 'epoch_s' },
            fields: {
              Speed_mph: { signal: 'speed_kmh', unit: 'mph' },
              P_W: { signal: 'power_kw', unit: 'W' },
              ECT_F: { signal: 'coolant_in_c', unit: '°F' },
              OAT_F: { signal: 'ambient_c', unit: '°F' },
              Fan: { signal: 'fan_pct', unit: 'fraction' },
            },
          },
        },
      ],
    ]);
    const payload = JSON.stringify([
      { ts: 1_785_000_000, Speed_mph: 50, P_W: 42_000, ECT_F: 194, OAT_F: 86, Fan: 0.5, note: 'ok' },
      { ts: 1_785_000_001, Speed_mph: 50, P_W: 42_000, ECT_F: 400, OAT_F: 86, Fan: 0.5 },
    ]);
    const d = decodeMessage(sampleTopic('bus-01'), Buffer.from(payload), {
      known_vehicles: known,
      now_ms: NOW,
      max_payload_bytes: 1 << 20,
      readings: mapped,
    });
    expect(d.samples).toEqual([
      {
        time_ms: 1_785_000_000_000,
        vehicle: 'bus-01',
        speed_kmh: 80.4672,
        power_kw: 42,
        coolant_in_c: 90,
        ambient_c: 30,
        fan_pct: 50,
      },
    ]);
    expect(d.rejects.map((r) => [r.reason, r.detail])).toEqual([
      [
        'range',
        '1 of 2 samples refused (range 1); samples[1]: coolant_in_c: coolant_in_c must be within -50…150',
      ],
    ]);
    expect(d.rejects[0]!.excerpt).toContain('"ECT_F":400');
  });
});

describe('frames over a real broker (Mosquitto, SQLite): same idempotency, ACL and acknowledgement as samples', () => {
  const ids = fleet.vehicles.map((v) => v.id);
  const dir = tempDir('frames');
  let broker: MosquittoServer;
  beforeAll(async () => {
    broker = await startMosquitto(fleetUsers(ids));
  });
  afterAll(async () => {
    await broker?.close();
  });

  it('part of the fleet on frames, published twice: every sample stored once, each batch tallied once', async () => {
    const store = createSqliteStore({ path: join(dir, 'frames.db') });
    const fleetFile = join(dir, 'fleet.json');
    writeFileSync(fleetFile, JSON.stringify(fleet));
    const config = readIngesterConfig(
      ingesterEnv({
        mqtt_url: broker.ingester_url,
        fleet_file: fleetFile,
        client_id: 'frames',
        spool_dir: join(dir, 'spool'),
        share_group: 'frames',
      }),
    );
    const ingester = createIngester(
      { ...config, metrics_port: -1 },
      { store, known_vehicles: known, vehicle_maps: specs(fleet) },
    );
    await ingester.start();
    const onFrames = new Set([ids[0]!, truck]);
    const range = { from_ms: sc.history.from_ms, to_ms: sc.history.from_ms + 12 * 3_600_000 };
    const credentials = (v: string) => ({ username: v, password: `test-${v}-pw` });
    const options = { url: broker.url, credentials, frames: onFrames, range, batch_size: 300 };
    const first = await publishScenario(null, sc, options);
    await publishScenario(null, sc, options); // a redelivery of everything
    const deadline = Date.now() + 60_000;
    while (ingester.metrics.messages_acked < 2 * first.messages && Date.now() < deadline) await sleep(100);
    expect(ingester.metrics.messages_acked).toBe(2 * first.messages);
    for (const v of ids) {
      const expected = [...sc.vehicleSamples(v, range)];
      const stored = await store.readSamples(v, 0, 8.64e15);
      expect(stored.n).toBe(expected.length);
      expect([...stored.coolant_in_c]).toEqual(expected.map((s) => s.coolant_in_c));
    }
    const totals = await store.frameTotals();
    expect(totals.map((t) => t.vehicle).sort()).toEqual([...onFrames].sort());
    for (const t of totals) {
      expect(t.samples).toBe([...sc.vehicleSamples(t.vehicle, range)].length);
      expect(t.incomplete).toBe(0);
      expect(t.decoded).toBe(t.frames);
    }
    expect(await store.countDeadLetters()).toEqual([]);
    await ingester.stop();
    await store.close();
  });

  it("a vehicle may not publish on another vehicle's frames topic", async () => {
    const intruder = await connectAs(broker.url, ids[0]!, { protocolVersion: 5, reconnectPeriod: 0 });
    await expect(
      intruder.publishAsync(frameTopic(ids[1]!), Buffer.from(encodeFrameBatch([])), { qos: 1 }),
    ).rejects.toMatchObject({ code: 135 });
    await intruder.endAsync(true);
  });
});
