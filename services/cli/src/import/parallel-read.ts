import { Worker } from 'node:worker_threads';
import { InputError, type Problem } from '@thermargin/shared';
import type { FrameCounts } from '@thermargin/logger-data/j1939/decoder';
import { readCsvFile } from './csv-reader.ts';
import { type DataFile, vehicleOfPath } from './data-files.ts';
import { DataReader, type ReadContext, type StreamOutcome } from './data-reader.ts';
import { type FileNotes, mergeSpans, type VehicleSpans } from './row-audit.ts';

/** What the reading of all files left: the same whether one thread read them or several. */
export interface ReadResult {
  outcomes: Map<string, StreamOutcome>;
  by_reason: Record<string, number>;
  unknown: Set<string>;
  frames: Record<string, FrameCounts>;
  rows: number;
  spans: VehicleSpans;
}

/** One file to read on a worker, with its place in the whole list. */
export interface Job {
  index: number;
  file: DataFile;
}
export interface WorkerInput {
  fleetPath: string;
  dataPath: string;
  mapPath: string | undefined;
  max_line_bytes: number | undefined;
  jobs: Job[];
}
/** Messages from a worker: a file's notes, bytes read, its results at the end, or the error that stopped it. */
export type WorkerMessage =
  | { type: 'notes'; index: number; notes: FileNotes }
  | { type: 'bytes'; n: number; rows: number }
  | {
      type: 'done';
      outcomes: [string, StreamOutcome][];
      by_reason: Record<string, number>;
      unknown: string[];
      frames: Record<string, FrameCounts>;
      rows: number;
      spans: [string, [string, { n: number; min: number; max: number }][]][];
      filesOf: [string, number[]][];
    }
  | { type: 'error'; message: string; problems?: Problem[] };

type Done = Extract<WorkerMessage, { type: 'done' }>;

/** A reader's results as a worker sends them (its streams finished). */
export function readerDone(reader: DataReader): Done {
  return {
    type: 'done',
    outcomes: [...reader.finish()],
    by_reason: reader.by_reason,
    unknown: [...reader.unknown],
    frames: reader.frames,
    rows: reader.rows,
    spans: [...reader.audit.vehicleSpans].map(([v, s]) => [v, [...s]]),
    filesOf: [...reader.filesOf],
  };
}

/** Thrown through the reader to stop at the first sample. */
class Found extends Error {
  constructor(readonly vehicle: string) {
    super(vehicle);
  }
}

/** The vehicle a file probably belongs to (its path's, or its first row's), to keep its files on one thread. */
function probableVehicle(file: DataFile, ctx: ReadContext, ids: string[]): string {
  const owner = vehicleOfPath(file.path, ctx.dataPath, ids);
  if (owner || file.kind === 'candump') return owner ?? file.path;
  try {
    readCsvFile(
      file.path,
      {
        sample: (v) => {
          throw new Found(v);
        },
        bad: () => {},
      },
      undefined,
      { map: ctx.globalMap, max_line_bytes: ctx.max_line_bytes },
    );
  } catch (e) {
    if (e instanceof Found) return e.vehicle;
  }
  return file.path; // unreadable here: its worker will say why
}

/** Files grouped by probable vehicle, the groups dealt to `threads` workers largest first (balanced bytes). */
export function planJobs(files: readonly DataFile[], ctx: ReadContext, threads: number): Job[][] {
  const ids = ctx.models.map((m) => m.id);
  const groups = new Map<string, Job[]>();
  files.forEach((file, index) => {
    const key = probableVehicle(file, ctx, ids);
    groups.set(key, [...(groups.get(key) ?? []), { index, file }]);
  });
  const bytes = (g: Job[]) => g.reduce((s, j) => s + j.file.bytes, 0);
  const plans = Array.from({ length: Math.min(threads, groups.size) }, () => ({
    bytes: 0,
    jobs: [] as Job[],
  }));
  for (const g of [...groups.values()].sort((a, b) => bytes(b) - bytes(a))) {
    const p = plans.reduce((a, b) => (b.bytes < a.bytes ? b : a));
    p.bytes += bytes(g);
    p.jobs.push(...g);
  }
  return plans.map((p) => p.jobs.sort((a, b) => a.index - b.index));
}

/**
 * Reads the files on worker threads, each taking whole vehicles (a vehicle's files on one thread, in
 * file order), so every vehicle's samples reach its stream in the same order as on one thread and the
 * results are the same. A vehicle whose rows turn up on two threads (files holding several vehicles) is
 * read again afterwards on this thread, from the files it was in, in order. Notes are told in file order.
 */
export async function readInParallel(
  input: Omit<WorkerInput, 'jobs'>,
  ctx: ReadContext,
  plans: Job[][],
  onNotes: (notes: FileNotes) => void,
  onBytes: (n: number, rows: number) => void,
): Promise<ReadResult> {
  const rows = plans.map(() => 0);
  const pending = new Map<number, FileNotes>();
  let next = 0;
  const told = (index: number, notes: FileNotes) => {
    pending.set(index, notes);
    for (let n = pending.get(next); n; n = pending.get(next)) {
      pending.delete(next++);
      onNotes(n);
    }
  };
  // Workers for all plans but the first, which this thread reads meanwhile: one start-up fewer.
  const working = plans.slice(1).map(
    (jobs, k) =>
      new Promise<Done>((resolve, reject) => {
        const w = new Worker(new URL('./analyze-worker-entry.mjs', import.meta.url), {
          workerData: { ...input, jobs } satisfies WorkerInput,
          // A worker refuses --input-type (this process may run from `node -e`); its entry loads tsx itself.
          execArgv: process.execArgv.filter((a) => !a.startsWith('--input-type')),
        });
        w.on('message', (m: WorkerMessage) => {
          if (m.type === 'notes') told(m.index, m.notes);
          else if (m.type === 'bytes') {
            rows[k + 1] = m.rows;
            onBytes(
              m.n,
              rows.reduce((a, b) => a + b, 0),
            );
          } else if (m.type === 'done') resolve(m);
          else reject(m.problems ? new InputError(m.problems, m.message) : new Error(m.message));
          if (m.type === 'done' || m.type === 'error') void w.terminate();
        });
        w.on('error', reject);
        w.on('exit', (code) => reject(new Error(`analyze worker stopped (exit ${code})`)));
      }),
  );
  // A worker's failure is reported once this thread is done, never left unhandled meanwhile.
  for (const p of working) p.catch(() => {});
  const own: DataReader = new DataReader(ctx, {
    onBytes: (n) => {
      rows[0] = own.rows;
      onBytes(
        n,
        rows.reduce((a, b) => a + b, 0),
      );
    },
  });
  for (const job of plans[0]!) told(job.index, own.read(job.file, job.index));
  const results = [readerDone(own), ...(await Promise.all(working))];
  const out: ReadResult = {
    outcomes: new Map(),
    by_reason: {},
    unknown: new Set(),
    frames: {},
    rows: 0,
    spans: new Map(),
  };
  const seenBy = new Map<string, number>();
  const filesOf = new Map<string, number[]>();
  for (const r of results) {
    for (const [v, o] of r.outcomes) {
      seenBy.set(v, (seenBy.get(v) ?? 0) + 1);
      out.outcomes.set(v, o);
    }
    for (const [v, idx] of r.filesOf) filesOf.set(v, [...(filesOf.get(v) ?? []), ...idx]);
    for (const [k, n] of Object.entries(r.by_reason)) out.by_reason[k] = (out.by_reason[k] ?? 0) + n;
    for (const v of r.unknown) out.unknown.add(v);
    Object.assign(out.frames, r.frames);
    out.rows += r.rows;
    mergeSpans(out.spans, new Map(r.spans.map(([v, s]) => [v, new Map(s)])));
  }
  const contested = new Set([...seenBy].filter(([, n]) => n > 1).map(([v]) => v));
  if (contested.size) {
    const again = new DataReader(ctx, { only: contested });
    const files = [...new Set([...contested].flatMap((v) => filesOf.get(v)!))].sort((a, b) => a - b);
    const all = plans.flat();
    for (const index of files) again.read(all.find((j) => j.index === index)!.file, index);
    for (const [v, o] of again.finish()) out.outcomes.set(v, o);
  }
  return out;
}
