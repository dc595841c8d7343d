import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Sample } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { mulberry32 } from '@thermargin/core/stats/prng';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { storeContract } from './contract.ts';

const dir = mkdtempSync(join(tmpdir(), 'thermargin-sqlite-'));
let n = 0;
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const path = () => join(dir, `store-${n++}.db`);

// A real file (WAL needs one), fresh per test.
storeContract('sqlite', async () => createSqliteStore({ path: path() }));
// Blocks of 3 samples: every write, rewrite and retention path of the packed history runs.
storeContract('sqlite, tiny blocks', async () =>
  createSqliteStore({ path: path(), blocks: { samples: 3, min_pack: 2, max_compact_samples: 6 } }),
);

describe('sqlite sample blocks', () => {
  // Times here are a few ms apart: the second case makes short holes end blocks, so writes into holes
  // between blocks (not only into blocks and after them) are checked too.
  it.each([
    ['blocks cut by size and neighbours', {}],
    ['blocks also cut at holes', { gap_ms: 3, gap_ratio: 2 }],
  ])(
    'answers like a plain map of vehicle + time under random writes, rewrites and retention (%s)',
    async (_, holes) => {
      const next = mulberry32(7);
      const int = (k: number) => Math.floor(next() * k);
      const file = path();
      const store = createSqliteStore({
        path: file,
        blocks: { samples: 8, min_pack: 5, max_compact_samples: 16, ...holes },
      });
      const model = new Map<string, Map<number, Sample>>();
      const sample = (vehicle: string, t: number, w: number): Sample => ({
        time_ms: t,
        vehicle,
        trip: int(3) === 0 ? undefined : `trip-${Math.floor(t / 50)}`,
        speed_kmh: w,
        power_kw: t / 7,
        coolant_in_c: 80,
        ambient_c: 20,
        fan_pct: int(100),
        ...(int(2) ? { coolant_out_c: 70 + int(5) } : {}),
      });
      let w = 0;
      let floor = 0;
      for (let round = 0; round < 300; round++) {
        const op = int(10);
        if (op === 0) {
          floor += int(40);
          await store.deleteBefore(floor);
          for (const m of model.values()) for (const t of m.keys()) if (t < floor) m.delete(t);
          continue;
        }
        // small batches in order, big ones (packed at once), and scattered rewrites of the past
        const vehicles = ['a', 'b', 'c'].slice(0, 1 + int(3));
        const batch: Sample[] = [];
        for (const v of vehicles) {
          const head = round * 10;
          const size = op === 1 ? 20 + int(30) : 1 + int(5);
          for (let k = 0; k < size; k++) {
            const t = op >= 8 ? floor + int(head + 10 - floor) : head + int(30) + (op === 1 ? k : 0);
            batch.push(sample(v, t, w++));
          }
        }
        await store.writeSamples(batch);
        for (const s of batch) {
          if (!model.has(s.vehicle)) model.set(s.vehicle, new Map());
          model.get(s.vehicle)!.set(s.time_ms, s);
        }
      }
      const spans = [];
      for (const [v, m] of [...model].sort(([a], [b]) => a.localeCompare(b))) {
        const want = [...m.values()].sort((a, b) => a.time_ms - b.time_ms);
        const c = await store.readSamples(v, Number.NEGATIVE_INFINITY, Number.POSITIVE_INFINITY);
        expect([...c.time_ms]).toEqual(want.map((s) => s.time_ms));
        expect([...c.speed_kmh]).toEqual(want.map((s) => s.speed_kmh));
        expect(c.trip).toEqual(want.map((s) => s.trip));
        expect([...c.coolant_out_c]).toEqual(want.map((s) => s.coolant_out_c ?? Number.NaN));
        const from = want[Math.floor(want.length / 3)]!.time_ms;
        const to = want[Math.floor((2 * want.length) / 3)]!.time_ms;
        const part = await store.readSamples(v, from, to);
        expect([...part.time_ms]).toEqual(
          want.filter((s) => s.time_ms >= from && s.time_ms < to).map((s) => s.time_ms),
        );
        spans.push({
          vehicle: v,
          first_ms: want[0]!.time_ms,
          last_ms: want.at(-1)!.time_ms,
          count: want.length,
        });
        expect((await store.latestSamples()).find((s) => s.vehicle === v)).toEqual(want.at(-1));
      }
      expect(await store.listVehicles()).toEqual(spans);
      await store.close();
      const db = new Database(file, { readonly: true });
      const count = (sql: string) => db.prepare(sql).pluck().get() as number;
      // Most of the history was packed, and the rest is still rows: both paths were read.
      expect(count('SELECT SUM(n) FROM sample_blocks')).toBeGreaterThan(
        count('SELECT COUNT(*) FROM samples'),
      );
      expect(count('SELECT COUNT(*) FROM samples')).toBeGreaterThan(0);
      db.close();
    },
  );

  it('packs a message that arrives after its successors into the hole it left, leaving its neighbours as written', async () => {
    const file = path();
    const store = createSqliteStore({ path: file });
    // 1 Hz samples in messages of 300 s; message 1 arrives last, as a shared subscription may deliver it.
    const message = (k: number): Sample[] =>
      Array.from({ length: 300 }, (_, i) => ({
        time_ms: (300 * k + i) * 1000,
        vehicle: 'a',
        speed_kmh: k,
        power_kw: 10,
        coolant_in_c: 80,
        ambient_c: 20,
        fan_pct: 0,
      }));
    await store.writeSamples([...message(0), ...message(2), ...message(3)]);
    const db = new Database(file, { readonly: true });
    const blocks = () =>
      db.prepare('SELECT id, first_ms, last_ms, n FROM sample_blocks ORDER BY first_ms').all() as {
        id: number;
        n: number;
      }[];
    const before = blocks();
    expect(before.map((b) => b.n)).toEqual([300, 599]); // the vehicle's newest sample stays a row
    await store.writeSamples(message(1));
    const after = blocks();
    expect(after).toEqual([
      before[0],
      { id: after[1]!.id, first_ms: 300_000, last_ms: 599_000, n: 300 },
      before[1],
    ]);
    const c = await store.readSamples('a', 0, Number.POSITIVE_INFINITY);
    expect(c.n).toBe(1200);
    expect([...c.speed_kmh].filter((_, i) => i % 300 === 0)).toEqual([0, 1, 2, 3]);
    db.close();
    await store.close();
  });
});
