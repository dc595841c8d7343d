/**
 * Crash probe (slow; not in the suite, which runs one of each): `npm start` killed with SIGKILL mid-stream
 * and with its data disk full, `PROBE_RUNS` times each (default 10, the kill placed anew each run), the
 * vehicles resending what was not acknowledged. Prints, per run and in all, what was acknowledged at
 * the kill against what the store held, and the final stored against sent.
 *   node --import tsx tests/probe/durability.ts
 * The disk-full runs need root (a small tmpfs is mounted); without it they are skipped, with the reason.
 */
import { mountSmallDisk } from '../support/small-disk.ts';
import { type CrashRun, crashRun } from '../services/stack/durability-run.ts';

const RUNS = Number(process.env.PROBE_RUNS ?? 10);
const runs: CrashRun[] = [];
for (const fault of ['kill', 'disk_full'] as const) {
  for (let i = 0; i < RUNS; i++) {
    const disk = fault === 'disk_full' ? mountSmallDisk(48 * 2 ** 20) : undefined;
    if (typeof disk === 'string') {
      console.log(`disk_full runs skipped: ${disk}`);
      break;
    }
    try {
      // A disk filled late may never stop the stream (SQLite reuses its WAL's pages): fill it early.
      const cut = fault === 'kill' ? 0.15 + (0.7 * i) / RUNS : 0.1 + (0.4 * i) / RUNS;
      const r = await crashRun({ fault, messages_per_vehicle: 160, cut, disk });
      runs.push(r);
      console.log(
        `${fault.padEnd(9)} run ${i + 1}: acked at kill ${r.samples_acked_at_kill} samples, stored at kill ${r.stored_at_kill}, ` +
          `acked but lost ${r.acked_samples_lost}; after restart stored ${r.samples_stored} of ${r.samples_sent} sent, duplicates ${r.duplicates}`,
      );
    } finally {
      if (disk) disk.close();
    }
  }
}
for (const fault of ['kill', 'disk_full'] as const) {
  const rs = runs.filter((r) => r.fault === fault);
  if (!rs.length) continue;
  const sum = (k: keyof CrashRun) => rs.reduce((n, r) => n + (r[k] as number), 0);
  console.log(
    `${fault}: ${rs.length} runs; acknowledged at kill ${sum('samples_acked_at_kill')} samples, of them lost ` +
      `${sum('acked_samples_lost')}; stored in the end ${sum('samples_stored')} of ${sum('samples_sent')} sent, ` +
      `duplicates ${sum('duplicates')}, checksums ${rs.every((r) => r.checksum_ok) ? 'all equal' : 'NOT equal'}`,
  );
}
process.exit(0);
