import { spawnSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { mountSmallDisk } from '../../support/small-disk.ts';

const START = join(import.meta.dirname, '../../../services/stack/src/start.ts');
const disk = mountSmallDisk(4 * 2 ** 20);

describe('npm start on a read-only data folder', () => {
  it.skipIf(typeof disk === 'string')(
    `stops at once naming the folder, the reason and what to do${typeof disk === 'string' ? ` (skipped: ${disk})` : ''}`,
    () => {
      if (typeof disk === 'string') return;
      try {
        const data = join(disk.dir, 'data');
        mkdirSync(data);
        writeFileSync(join(data, 'samples.db'), ''); // a second start: its files are there
        disk.remount('ro');
        const r = spawnSync(process.execPath, ['--import', 'tsx', START], {
          env: { ...process.env, THERMARGIN_DATA_DIR: data, THERMARGIN_BROKER_PORT: '0', API_PORT: '0' },
          encoding: 'utf8',
        });
        expect(r.status).toBe(1);
        expect(r.stderr).toContain(
          `thermargin start: the data folder ${data} cannot be written: read-only (EROFS). It holds the stores`,
        );
        expect(r.stderr).toContain('or set THERMARGIN_DATA_DIR to a writable folder');
        expect(r.stderr).not.toMatch(/unable to open database file|\n\s+at /);
      } finally {
        disk.close();
      }
    },
  );
});
