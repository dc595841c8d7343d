/**
 * `npm run bench:core`: throughput of the estimator and of `thermargin analyze` end to end, each beside
 * a baseline measured in the same run on the same machine. Prints figures; asserts nothing.
 */
import { spawnSync } from 'node:child_process';
import {
  createReadStream,
  createWriteStream,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { NUMERIC_COLUMNS } from '@thermargin/shared';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { BUS_CONFIG } from '../support/vehicle-fixture.ts';
import { syntheticColumns } from './synthetic-trips.ts';

const ESTIMATOR_SAMPLES = Number(process.env.BENCH_SAMPLES ?? 10_000_000);
const CSV_ROWS = Number(process.env.BENCH_ROWS ?? 2_000_000);
const FOLDER_ROWS = Number(process.env.BENCH_FOLDER_ROWS ?? 7_000_000);
const FOLDER_VEHICLES = 20;
const fmt = (x: number) => Math.round(x).toLocaleString('en-US');

function time<T>(f: () => T): { s: number; value: T } {
  const t0 = process.hrtime.bigint();
  const value = f();
  return { s: Number(process.hrtime.bigint() - t0) / 1e9, value };
}

function estimator(): void {
  const vehicle = resolveVehicle(BUS_CONFIG);
  const cols = syntheticColumns(ESTIMATOR_SAMPLES);
  // Baseline: one pass touching every numeric column once (the memory-bandwidth floor of any estimator).
  const base = time(() => {
    let acc = 0;
    for (const name of NUMERIC_COLUMNS) {
      const a = cols[name];
      for (let i = 0; i < a.length; i++) acc += a[i]!;
    }
    return acc;
  });
  const run = time(() => analyzeVehicle(vehicle, cols));
  const rate = ESTIMATOR_SAMPLES / run.s;
  console.log(
    `estimator: ${fmt(ESTIMATOR_SAMPLES)} samples, ${run.value.trips.length} trips in ${run.s.toFixed(2)} s`,
  );
  console.log(`  analyzeVehicle         ${fmt(rate)} samples/s   (target ≥ 5,000,000)`);
  console.log(
    `  baseline column scan   ${fmt(ESTIMATOR_SAMPLES / base.s)} samples/s   ratio ${(rate / (ESTIMATOR_SAMPLES / base.s)).toFixed(3)}`,
  );
}

/** One vehicle's rows in time order (trips one after another), as a logger's export writes them. */
async function writeCsv(file: string, rows: number, vehicle = 'bus-01', seed = 1): Promise<void> {
  const out = createWriteStream(file);
  out.write(
    'time,vehicle,trip,speed_kmh,power_kw,coolant_in_c,coolant_out_c,ambient_c,fan_pct,coolant_flow_lpm,derate\n',
  );
  // Whole one-hour trips per piece; each piece starts 10 minutes (a stop, as between its trips) after the last.
  const per = 70 * 3600;
  let shift_ms = 0;
  for (let from = 0; from < rows; from += per) {
    const c = syntheticColumns(Math.min(per, rows - from), from + seed);
    const lines: string[] = [];
    for (let i = 0; i < c.n; i++) {
      lines.push(
        `${new Date(c.time_ms[i]! + shift_ms).toISOString()},${vehicle},,${c.speed_kmh[i]!.toFixed(2)},${c.power_kw[i]!.toFixed(2)},${c.coolant_in_c[i]!.toFixed(3)},,${c.ambient_c[i]},${c.fan_pct[i]},,0`,
      );
    }
    shift_ms += c.time_ms[c.n - 1]! - c.time_ms[0]! + 600_000;
    if (!out.write(`${lines.join('\n')}\n`)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
}

/** The CLI in a child process: wall seconds, its CPU seconds (user + system) and peak RSS in MB. */
function runAnalyze(
  args: string[],
  out = '/dev/null',
): { s: number; cpu_s: number; rss_mb: number; code: number } {
  const script = `const { main } = await import(${JSON.stringify(join(import.meta.dirname, '../../services/cli/src/main.ts'))});
const code = await main(${JSON.stringify(['analyze', ...args, '--out', out])});
const u = process.resourceUsage();
process.stderr.write('\\nusage=' + u.maxRSS + ',' + (u.userCPUTime + u.systemCPUTime) + '\\n'); process.exitCode = code;`;
  const t0 = process.hrtime.bigint();
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', script], {
    encoding: 'utf8',
  });
  const s = Number(process.hrtime.bigint() - t0) / 1e9;
  const [, rss_kb, cpu_us] = /usage=(\d+),(\d+)/.exec(r.stderr) ?? [];
  return { s, cpu_s: Number(cpu_us) / 1e6, rss_mb: Number(rss_kb) / 1024, code: r.status ?? -1 };
}

async function endToEnd(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-bench-'));
  try {
    const fleet = join(dir, 'fleet.json');
    writeFileSync(fleet, JSON.stringify({ vehicles: [BUS_CONFIG] }));
    const half = join(dir, 'half.csv');
    const full = join(dir, 'full.csv');
    await writeCsv(half, CSV_ROWS / 2);
    await writeCsv(full, CSV_ROWS);
    // Baseline: stream the same file and split it into lines, no parsing (the read ceiling).
    const t0 = process.hrtime.bigint();
    let lines = 0;
    for await (const chunk of createReadStream(full, { encoding: 'utf8', highWaterMark: 1 << 20 }))
      lines += (chunk as string).split('\n').length - 1;
    const baseS = Number(process.hrtime.bigint() - t0) / 1e9;
    // Start-up alone: every module loaded, then a usage error (no --data) before any row is read.
    const start = runAnalyze(['--fleet', fleet]);
    const h = runAnalyze(['--fleet', fleet, '--data', half]);
    const f = runAnalyze(['--fleet', fleet, '--data', full]);
    const rate = CSV_ROWS / f.s;
    console.log(
      `thermargin analyze end to end: ${fmt(CSV_ROWS)} rows, ${(statSync(full).size / 1048576).toFixed(0)} MB CSV`,
    );
    console.log(
      `  analyze (process start to exit)  ${fmt(rate)} rows/s in ${f.s.toFixed(2)} s   (target ≥ 500,000)  exit ${f.code}`,
    );
    console.log(
      `  baseline read + split lines      ${fmt(lines / baseS)} rows/s   ratio ${(rate / (lines / baseS)).toFixed(3)}`,
    );
    console.log(
      `  CPU time: ${f.cpu_s.toFixed(2)} s at ${fmt(CSV_ROWS)} rows, ${h.cpu_s.toFixed(2)} s at ${fmt(CSV_ROWS / 2)}, ${start.cpu_s.toFixed(2)} s start-up alone (${start.s.toFixed(2)} s wall)`,
    );
    console.log(
      `  peak RSS: ${h.rss_mb.toFixed(0)} MB at ${fmt(CSV_ROWS / 2)} rows, ${f.rss_mb.toFixed(0)} MB at ${fmt(CSV_ROWS)} rows (ratio ${(f.rss_mb / h.rss_mb).toFixed(2)}; ${start.rss_mb.toFixed(0)} MB start-up alone)`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * A folder of many vehicles (one file each), analysed on one thread and on the machine's cores (vehicles
 * spread over worker threads): rows/s, CPU, peak RSS (of the main thread's process, which holds the
 * workers), and whether the two results are the same byte for byte.
 */
async function folder(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-bench-folder-'));
  try {
    const ids = Array.from({ length: FOLDER_VEHICLES }, (_, i) => `bus-${String(i + 1).padStart(2, '0')}`);
    const fleet = join(dir, 'fleet.json');
    writeFileSync(fleet, JSON.stringify({ vehicles: ids.map((id) => ({ ...BUS_CONFIG, id })) }));
    /** The folder of `rows` rows in all, one file per vehicle. */
    const write = async (name: string, rows: number) => {
      const data = join(dir, name);
      mkdirSync(data);
      for (const [i, id] of ids.entries())
        await writeCsv(join(data, `${id}.csv`), Math.floor(rows / ids.length), id, 1 + i * 7919);
      return data;
    };
    const half = await write('half', FOLDER_ROWS / 2);
    const data = await write('full', FOLDER_ROWS);
    const rows = Math.floor(FOLDER_ROWS / ids.length) * ids.length;
    const mb = ids.reduce((a, id) => a + statSync(join(data, `${id}.csv`)).size, 0) / 1048576;
    const threads = availableParallelism();
    const on = (path: string, n: number, out: string) =>
      runAnalyze(['--fleet', fleet, '--data', path, '--threads', String(n)], join(dir, out));
    const one = on(data, 1, 'one.json');
    const many = on(data, threads, 'many.json');
    const smaller = on(half, threads, 'half.json');
    const same = readFileSync(join(dir, 'one.json')).equals(readFileSync(join(dir, 'many.json')));
    console.log(
      `thermargin analyze on a folder: ${fmt(rows)} rows of ${ids.length} vehicles, ${mb.toFixed(0)} MB CSV`,
    );
    console.log(
      `  ${threads} threads   ${fmt(rows / many.s)} rows/s in ${many.s.toFixed(2)} s, CPU ${many.cpu_s.toFixed(2)} s   (target ≥ 1,200,000)  exit ${many.code}`,
    );
    console.log(
      `  baseline 1 thread  ${fmt(rows / one.s)} rows/s in ${one.s.toFixed(2)} s, CPU ${one.cpu_s.toFixed(2)} s   ratio ${(one.s / many.s).toFixed(2)}; results identical: ${same}`,
    );
    console.log(
      `  peak RSS on ${threads} threads: ${smaller.rss_mb.toFixed(0)} MB at ${fmt(rows / 2)} rows, ${many.rss_mb.toFixed(0)} MB at ${fmt(rows)} (ratio ${(many.rss_mb / smaller.rss_mb).toFixed(2)}); 1 thread ${one.rss_mb.toFixed(0)} MB`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

estimator();
await endToEnd();
await folder();
