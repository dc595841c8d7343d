import { createInfluxStore } from '@thermargin/store';
import type { Sample } from '@thermargin/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type InfluxServer, startInflux } from '../../support/servers/influx.ts';
import { storeContract } from './contract.ts';

let server: InfluxServer;
let n = 0;
beforeAll(async () => {
  server = await startInflux();
});
afterAll(async () => {
  await server?.close();
});

// Debian's InfluxDB 1.6.7, the adapter's 1.x mode; a fresh database per test.
storeContract('influx (1.x API, real influxd 1.6)', async () => {
  const database = `contract_${n++}`;
  await server.createDatabase(database);
  return createInfluxStore({ url: server.url, api: 'v1', database });
});

describe('influx late marks with two writers (ingester replicas on one subscription)', () => {
  it("a batch behind another writer's newer sample is marked, though its own writer never saw that sample", async () => {
    await server.createDatabase('two_writers');
    const open = () => createInfluxStore({ url: server.url, api: 'v1', database: 'two_writers' });
    const [a, b] = [open(), open()];
    const t0 = Date.UTC(2025, 5, 1, 8);
    const s = (i: number): Sample => ({
      time_ms: t0 + i * 1000,
      vehicle: 'v-1',
      trip: 'trip-1',
      speed_kmh: 50,
      power_kw: 20,
      coolant_in_c: 80,
      ambient_c: 30,
      fan_pct: 0,
    });
    try {
      await b.writeSamples([s(0)]); // b learns the vehicle's newest: sample 0
      await a.writeSamples([s(10), s(11), s(12)]); // an analyzer may read past 5 now
      await b.writeSamples([s(5)]);
      const marks = await a.lateMarks();
      expect(marks.map(({ vehicle, from_ms, count }) => ({ vehicle, from_ms, count }))).toEqual([
        { vehicle: 'v-1', from_ms: t0 + 5000, count: 1 },
      ]);
    } finally {
      await a.close();
      await b.close();
    }
  });
});
