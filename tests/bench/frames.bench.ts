/**
 * `npm run bench:frames`: SAE J1939 frame decoding from a `candump -l` log (parse, decode, resample into
 * samples), in a child process at two file sizes, beside a baseline measured in the same run on the same
 * file: reading it and splitting it into lines, no parsing. Prints frames/s, the ratio and peak RSS at
 * both sizes (it should stay flat); asserts nothing. `BENCH_FRAMES` sets the larger size.
 */
import { spawnSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, rmSync, statSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { compileFrames } from '@thermargin/logger-data/j1939/config';
import { FrameDecoder } from '@thermargin/logger-data/j1939/decoder';
import { readCandumpFile } from '@thermargin/logger-data/io/candump-file';
import { forEachLine } from '@thermargin/logger-data/io/lines';
import type { Sample } from '@thermargin/shared';
import { candumpLine, DEMO_FRAME_MAPS, sampleFrames } from '../../services/simulator/src/frames.ts';

const FRAMES = Number(process.env.BENCH_FRAMES ?? 4_000_000);
const fmt = (x: number) => Math.round(x).toLocaleString('en-US');

/** Child: decodes the log (or only splits its lines) and reports frames, samples, seconds, peak RSS. */
if (process.argv[2] === 'run') {
  const [file, mode] = process.argv.slice(3) as [string, 'decode' | 'lines'];
  const t0 = performance.now();
  let frames = 0;
  let samples = 0;
  if (mode === 'lines') forEachLine(file, () => frames++);
  else {
    const { config } = compileFrames(DEMO_FRAME_MAPS.electric.frames);
    const decoder = new FrameDecoder(config, () => samples++);
    frames = readCandumpFile(
      file,
      (t, id, len, bytes, at) => decoder.frame(t, id, len, bytes, at),
      () => {},
    ).frames;
    decoder.finish();
  }
  const s = (performance.now() - t0) / 1000;
  process.stdout.write(JSON.stringify({ frames, samples, s, rss_mb: process.resourceUsage().maxRSS / 1024 }));
  process.exit(0);
}

/** A log of about `n` frames: a bus's trips (6 frames a second), synthetic but varied values. */
function writeLog(file: string, n: number): void {
  const fd = openSync(file, 'w');
  let lines: string[] = [];
  const t0 = Date.UTC(2026, 6, 1, 6);
  for (let i = 0, frames = 0; frames < n; i++) {
    const s: Sample = {
      time_ms: t0 + i * 1000 + Math.floor(i / 3600) * 600_000, // hour-long trips, 10 min apart
      vehicle: 'bench-01',
      speed_kmh: (i * 7) % 90,
      power_kw: ((i * 13) % 300) - 40,
      coolant_in_c: 70 + (i % 25),
      coolant_out_c: 62 + (i % 20),
      ambient_c: 25 + (i % 10),
      fan_pct: (i * 3) % 100,
      coolant_flow_lpm: 150 + (i % 50),
      derate: 0,
    };
    for (const f of sampleFrames(s, false)) lines.push(candumpLine(f));
    frames += 6;
    if (lines.length >= 60_000) {
      writeSync(fd, `${lines.join('\n')}\n`);
      lines = [];
    }
  }
  if (lines.length) writeSync(fd, `${lines.join('\n')}\n`);
  closeSync(fd);
}

function child(file: string, mode: 'decode' | 'lines') {
  const r = spawnSync(process.execPath, ['--import', 'tsx', import.meta.filename, 'run', file, mode], {
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(r.stderr);
  return JSON.parse(r.stdout) as { frames: number; samples: number; s: number; rss_mb: number };
}

const dir = mkdtempSync(join(tmpdir(), 'thermargin-bench-frames-'));
try {
  const half = join(dir, 'half.log');
  const full = join(dir, 'full.log');
  writeLog(half, FRAMES / 2);
  writeLog(full, FRAMES);
  const base = child(full, 'lines');
  const h = child(half, 'decode');
  const f = child(full, 'decode');
  const rate = f.frames / f.s;
  console.log(
    `J1939 frames from a candump -l log: ${fmt(f.frames)} frames, ${(statSync(full).size / 1048576).toFixed(0)} MB → ${fmt(f.samples)} samples`,
  );
  console.log(
    `  parse + decode + resample   ${fmt(rate)} frames/s in ${f.s.toFixed(2)} s   (target ≥ 2,000,000)`,
  );
  console.log(
    `  baseline read + split lines ${fmt(base.frames / base.s)} lines/s   ratio ${(rate / (base.frames / base.s)).toFixed(3)}`,
  );
  console.log(
    `  peak RSS: ${h.rss_mb.toFixed(0)} MB at ${fmt(h.frames)} frames, ${f.rss_mb.toFixed(0)} MB at ${fmt(f.frames)} (ratio ${(f.rss_mb / h.rss_mb).toFixed(2)})`,
  );
} finally {
  rmSync(dir, { recursive: true, force: true });
}
