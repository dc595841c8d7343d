import { parentPort, workerData } from 'node:worker_threads';
import { InputError } from '@thermargin/shared';
import { DataReader, loadContext } from './data-reader.ts';
import { readerDone, type WorkerInput, type WorkerMessage } from './parallel-read.ts';

/** A thread of `readInParallel`: reads its files in order, tells each file's notes, sends its vehicles' outcomes. */
const input = workerData as WorkerInput;
const port = parentPort!;
const post = (m: WorkerMessage) => port.postMessage(m);

try {
  const ctx = loadContext(input.fleetPath, input.dataPath, input.mapPath, input.max_line_bytes);
  const reader: DataReader = new DataReader(ctx, {
    onBytes: (n) => post({ type: 'bytes', n, rows: reader.rows }),
  });
  for (const job of input.jobs)
    post({ type: 'notes', index: job.index, notes: reader.read(job.file, job.index) });
  post(readerDone(reader));
} catch (e) {
  post(
    e instanceof InputError
      ? { type: 'error', message: e.message.split(':\n')[0]!, problems: e.problems }
      : { type: 'error', message: (e as Error).stack ?? String(e) },
  );
}
