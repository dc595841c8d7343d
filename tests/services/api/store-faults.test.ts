import { join } from 'node:path';
import { statusResponseSchema } from '@thermargin/shared';
import { createScenario } from '@thermargin/simulator';
import { createSqliteStore, StoreFaultError } from '@thermargin/store';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { mountSmallDisk } from '../../support/small-disk.ts';
import { tempDir } from '../ingester/support.ts';
import { startApiStack } from './stack.ts';

const scenario = createScenario({ vehicles: 1, days: 1, seed: 7 });
const ID = scenario.fleet.vehicles[0]!.id;
const disk = mountSmallDisk(24 * 2 ** 20);
const skip = typeof disk === 'string' ? ` (skipped: ${disk})` : '';

describe('store faults are reported as they are', () => {
  it.skipIf(typeof disk === 'string')(
    `disk full: status names it, a write answers 503 with it${skip}`,
    async () => {
      if (typeof disk === 'string') return;
      const samples = createSqliteStore({ path: join(disk.dir, 'samples.db') });
      await samples.writeSamples([...scenario.vehicleSamples(ID)].slice(0, 2000));
      const stack = await startApiStack(disk.dir, scenario.fleet, samples, () => scenario.history.to_ms);
      const status = async () =>
        statusResponseSchema.parse(await (await stack.get('/api/status')).json()).store;
      try {
        await stack.analyzer.runOnce();
        expect(await status()).toMatchObject({ up: true, fault: null, error: null });
        disk.fill();
        const full = await status();
        expect(full).toMatchObject({ up: false, fault: 'disk_full' });
        expect(full.error).toContain(`bytes free on the disk of ${disk.dir}`);
        // Notes until a write needs a page the disk cannot give.
        let r: Response | undefined;
        for (let i = 0; i < 200 && (!r || r.status === 200); i++)
          r = await stack.send(
            'POST',
            `/api/vehicles/${ID}/maintenance`,
            { date: '2026-07-30', action: 'fan_repaired', note: 'x'.repeat(2000) },
            'engineer',
          );
        expect(r!.status).toBe(503);
        const body = (await r!.json()) as { error: { code: string; message: string } };
        expect(body.error).toMatchObject({ code: 'store_unavailable' });
        expect(body.error.message).toMatch(/^results store \(sqlite\): disk full \(SQLITE_FULL/);
        disk.free();
        expect(await status()).toMatchObject({ up: true, fault: null });
      } finally {
        await stack.close();
        await samples.close();
        disk.close();
      }
    },
  );

  it('locked by another process: status says so', async () => {
    const dir = tempDir('locked');
    const samples = createSqliteStore({ path: join(dir, 'samples.db') });
    const stack = await startApiStack(dir, scenario.fleet, samples, () => scenario.history.to_ms);
    const other = new Database(join(dir, 'samples.db'));
    try {
      other.exec('BEGIN EXCLUSIVE');
      const s = statusResponseSchema.parse(await (await stack.get('/api/status')).json()).store;
      expect(s).toMatchObject({ up: false, fault: 'locked' });
      expect(s.error).toMatch(/^locked by another process \(SQLITE_BUSY/);
      other.exec('ROLLBACK');
      expect(statusResponseSchema.parse(await (await stack.get('/api/status')).json()).store.up).toBe(true);
    } finally {
      other.close();
      await stack.close();
      await samples.close();
    }
  });

  it.skipIf(typeof disk === 'string')(
    `a read-only data folder at start: the file, the reason and what to do${skip}`,
    async () => {
      const ro = mountSmallDisk(4 * 2 ** 20);
      if (typeof ro === 'string') return;
      try {
        createSqliteStore({ path: join(ro.dir, 'samples.db') }).close();
        ro.remount('ro');
        let error: unknown;
        try {
          createSqliteStore({ path: join(ro.dir, 'samples.db') });
        } catch (e) {
          error = e;
        }
        expect(error).toBeInstanceOf(StoreFaultError);
        expect((error as StoreFaultError).fault.kind).toBe('read_only');
        expect((error as Error).message).toBe(
          `cannot open the SQLite file ${join(ro.dir, 'samples.db')}: read-only: ${ro.dir} (EROFS); ` +
            `make ${ro.dir} writable for this user (remount it read-write, or chown/chmod it), or point the ` +
            'store elsewhere (STORE_SQLITE_PATH, RESULTS_SQLITE_PATH; THERMARGIN_DATA_DIR for npm start)',
        );
      } finally {
        ro.close();
      }
    },
  );
});
