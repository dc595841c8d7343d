import type { DeadLetter, SampleStore } from '@thermargin/store';
import type { Sample } from '@thermargin/shared';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

/** The one contract every SampleStore adapter passes; `open` gives an empty store. */
export function storeContract(name: string, open: () => Promise<SampleStore>): void {
  describe(`SampleStore contract: ${name}`, () => {
    let store: SampleStore;
    beforeEach(async () => {
      store = await open();
    });
    afterEach(async () => {
      await store.close();
    });

    const t0 = Date.UTC(2025, 5, 1, 8);
    const sample = (vehicle: string, i: number, extra: Partial<Sample> = {}): Sample => ({
      time_ms: t0 + i * 1000,
      vehicle,
      trip: 'trip-1',
      speed_kmh: 50 + (i % 30),
      power_kw: 80.25 - i,
      coolant_in_c: 70 + i / 100,
      ambient_c: 30.5,
      fan_pct: i % 100,
      ...extra,
    });

    it('reads one vehicle back in columns sorted by time, whatever the write order', async () => {
      const samples = [3, 0, 2, 1].map((i) =>
        sample('v-1', i, i === 2 ? { coolant_out_c: 61.5, derate: 1 } : {}),
      );
      await store.writeSamples([...samples, sample('v-2', 0)]);
      const c = await store.readSamples('v-1', t0, t0 + 10_000);
      expect(c.n).toBe(4);
      expect([...c.time_ms]).toEqual([0, 1, 2, 3].map((i) => t0 + i * 1000));
      expect([...c.power_kw]).toEqual([80.25, 79.25, 78.25, 77.25]);
      expect(c.coolant_out_c[2]).toBe(61.5);
      expect(c.derate[2]).toBe(1);
      expect(Number.isNaN(c.coolant_out_c[0]!)).toBe(true);
      expect(Number.isNaN(c.coolant_flow_lpm[1]!)).toBe(true);
      expect(c.trip).toEqual(['trip-1', 'trip-1', 'trip-1', 'trip-1']);
    });

    it('keeps a missing trip as undefined', async () => {
      await store.writeSamples([sample('v-1', 0, { trip: undefined })]);
      expect((await store.readSamples('v-1', t0, t0 + 1)).trip).toEqual([undefined]);
    });

    it('range is from ≤ time < to', async () => {
      await store.writeSamples([0, 1, 2, 3].map((i) => sample('v-1', i)));
      const c = await store.readSamples('v-1', t0 + 1000, t0 + 3000);
      expect([...c.time_ms]).toEqual([t0 + 1000, t0 + 2000]);
      expect((await store.readSamples('nobody', t0, t0 + 1e9)).n).toBe(0);
    });

    it('is idempotent on vehicle + time: duplicates and rewrites leave one sample, the last written', async () => {
      const batch = [0, 1, 2].map((i) => sample('v-1', i));
      await store.writeSamples(batch);
      await store.writeSamples(batch);
      await store.writeSamples([sample('v-1', 1, { speed_kmh: 99 }), sample('v-1', 1, { speed_kmh: 99 })]);
      const c = await store.readSamples('v-1', t0, t0 + 10_000);
      expect(c.n).toBe(3);
      expect(c.speed_kmh[1]).toBe(99);
      expect((await store.listVehicles())[0]?.count).toBe(3);
    });

    it('stores time to the millisecond', async () => {
      await store.writeSamples([sample('v-1', 0, { time_ms: t0 + 0.4 })]);
      expect([...(await store.readSamples('v-1', t0, t0 + 1)).time_ms]).toEqual([t0]);
    });

    it('lists vehicles with first and last sample time and count, and the latest sample of each', async () => {
      await store.writeSamples([
        sample('b', 5),
        sample('a', 2),
        sample('b', 1),
        sample('a', 9, { derate: 0 }),
      ]);
      expect(await store.listVehicles()).toEqual([
        { vehicle: 'a', first_ms: t0 + 2000, last_ms: t0 + 9000, count: 2 },
        { vehicle: 'b', first_ms: t0 + 1000, last_ms: t0 + 5000, count: 2 },
      ]);
      expect(await store.latestSamples()).toEqual([sample('a', 9, { derate: 0 }), sample('b', 5)]);
    });

    it('writes many samples in one call (several client batches) and reads them all', async () => {
      const many = Array.from({ length: 12_000 }, (_, i) => sample('bulk', i));
      await store.writeSamples(many);
      const c = await store.readSamples('bulk', t0, t0 + 1e9);
      expect(c.n).toBe(12_000);
      expect(c.fan_pct.reduce((a, b) => a + b, 0)).toBe(many.reduce((a, s) => a + s.fan_pct, 0));
    });

    const letter = (i: number, extra: Partial<DeadLetter> = {}): DeadLetter => ({
      received_ms: t0 + i,
      vehicle: 'v-1',
      reason: 'range',
      detail: 'speed_kmh must be within 0…250',
      topic: 'thermargin/v1/vehicles/v-1/samples',
      excerpt: `{"speed_kmh": 900, "note": "quote \\" backslash \\\\ newline \n end"}`,
      payload_bytes: 120,
      ...extra,
    });

    it('keeps dead letters (several in one millisecond), newest first, filtered and counted', async () => {
      await store.writeDeadLetters([
        letter(0),
        letter(0),
        letter(1, { reason: 'json', detail: 'Unexpected end of JSON input' }),
        letter(2, { vehicle: '', reason: 'topic', topic: 'elsewhere' }),
      ]);
      const all = await store.readDeadLetters();
      expect(all).toHaveLength(4);
      expect(all[0]).toEqual(letter(2, { vehicle: '', reason: 'topic', topic: 'elsewhere' }));
      expect(all[3]).toEqual(letter(0));
      expect(await store.readDeadLetters({ reason: 'range' })).toHaveLength(2);
      expect(await store.readDeadLetters({ vehicle: 'v-1', limit: 1 })).toEqual([
        letter(1, { reason: 'json', detail: 'Unexpected end of JSON input' }),
      ]);
      // '' picks the messages whose vehicle could not be read (the intake screen asks for them so).
      expect(await store.readDeadLetters({ vehicle: '' })).toEqual([
        letter(2, { vehicle: '', reason: 'topic', topic: 'elsewhere' }),
      ]);
      expect(await store.countDeadLetters()).toEqual([
        { vehicle: '', reason: 'topic', count: 1 },
        { vehicle: 'v-1', reason: 'json', count: 1 },
        { vehicle: 'v-1', reason: 'range', count: 2 },
      ]);
    });

    it('retention deletes samples and dead letters before a time', async () => {
      await store.writeSamples([0, 1, 2, 3].map((i) => sample('v-1', i)));
      await store.writeDeadLetters([letter(0), letter(5000)]);
      await store.deleteBefore(t0 + 2000);
      expect([...(await store.readSamples('v-1', 0, t0 + 1e9)).time_ms]).toEqual([t0 + 2000, t0 + 3000]);
      expect(await store.readDeadLetters()).toEqual([letter(5000)]);
    });

    it("marks samples written behind their vehicle's newest, and clears exactly the marks read", async () => {
      const earliest = async () => {
        const by = new Map<string, number>();
        for (const m of await store.lateMarks())
          by.set(m.vehicle, Math.min(by.get(m.vehicle) ?? m.from_ms, m.from_ms));
        return Object.fromEntries(by);
      };
      await store.writeSamples([10, 11, 12].map((i) => sample('v-1', i)));
      await store.writeSamples([sample('v-1', 20), sample('v-2', 0)]);
      expect(await store.lateMarks()).toEqual([]);
      await store.writeSamples([sample('v-1', 6), sample('v-1', 5), sample('v-1', 30), sample('v-2', 1)]);
      const marks = await store.lateMarks();
      expect(marks.map(({ vehicle, from_ms, count }) => ({ vehicle, from_ms, count }))).toEqual([
        { vehicle: 'v-1', from_ms: t0 + 5000, count: 2 },
      ]);
      // A late write between the read and the clear keeps a mark for what it wrote.
      await store.writeSamples([sample('v-1', 3)]);
      await store.clearLateMarks(marks);
      expect(await earliest()).toEqual({ 'v-1': t0 + 3000 });
      await store.clearLateMarks(await store.lateMarks());
      expect(await store.lateMarks()).toEqual([]);
    });

    const tally = (vehicle: string, start: number, n: number) => ({
      vehicle,
      start_ms: t0 + start * 1000,
      frames: 8 * n,
      decoded: 7 * n,
      unknown_pgn: n,
      not_available: 2,
      error_values: 1,
      samples: n,
      incomplete: 0,
    });

    it('keeps frame tallies per batch, a rewritten batch once, and sums them per vehicle', async () => {
      await store.writeFrameTallies([tally('v-1', 0, 60), tally('v-1', 60, 60), tally('v-2', 0, 10)]);
      await store.writeFrameTallies([tally('v-1', 60, 60)]); // redelivered
      expect(await store.frameTotals()).toEqual([
        {
          vehicle: 'v-1',
          batches: 2,
          frames: 960,
          decoded: 840,
          unknown_pgn: 120,
          not_available: 4,
          error_values: 2,
          samples: 120,
          incomplete: 0,
        },
        {
          vehicle: 'v-2',
          batches: 1,
          frames: 80,
          decoded: 70,
          unknown_pgn: 10,
          not_available: 2,
          error_values: 1,
          samples: 10,
          incomplete: 0,
        },
      ]);
      await store.deleteBefore(t0 + 30_000);
      expect((await store.frameTotals()).map((t) => [t.vehicle, t.batches])).toEqual([['v-1', 1]]);
    });

    it('answers ping', async () => {
      await expect(store.ping()).resolves.toBeUndefined();
    });
  });
}
