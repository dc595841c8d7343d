import { describe, expect, it } from 'vitest';
import { mountSmallDisk } from '../../support/small-disk.ts';
import { type CrashRun, crashRun } from './durability-run.ts';

/** Nothing acknowledged is lost, nothing is stored twice (tests/probe/durability.ts repeats these runs). */
function expectWhole(r: CrashRun): void {
  const line = JSON.stringify(r);
  expect(r.acked_at_kill, line).toBeGreaterThan(0);
  // The fault stopped the acknowledgements (the kill came before the stream ended).
  expect(r.acked_at_kill, line).toBeLessThan(r.messages_sent);
  expect(r.acked_samples_lost, line).toBe(0);
  expect(r.stored_at_kill, line).toBeGreaterThanOrEqual(r.samples_acked_at_kill);
  expect(r.samples_stored, line).toBe(r.samples_sent);
  expect(r.duplicates, line).toBe(0);
  expect(r.checksum_ok, line).toBe(true);
}

const disk = mountSmallDisk(48 * 2 ** 20);

describe('npm start killed with SIGKILL: the vehicles resend what was not acknowledged', () => {
  it('mid-stream: every acknowledged sample is stored, and after the restart all of them once', async () => {
    expectWhole(await crashRun({ fault: 'kill', messages_per_vehicle: 120, cut: 0.4 }));
  }, 300_000);

  it.skipIf(typeof disk === 'string')(
    `with the data disk full: nothing acknowledged after it filled, nothing lost${typeof disk === 'string' ? ` (skipped: ${disk})` : ''}`,
    async () => {
      if (typeof disk === 'string') return;
      try {
        const r = await crashRun({ fault: 'disk_full', messages_per_vehicle: 120, cut: 0.3, disk });
        expectWhole(r);
        // The console said why nothing was acknowledged any more (its filter hid store_down before).
        expect(r.console_faults.join('\n')).toMatch(
          /store_down \{"kind":"disk_full","reason":"disk full \(SQLITE_FULL/,
        );
      } finally {
        disk.close();
      }
    },
    300_000,
  );
});
