import {
  closeSync,
  fsyncSync,
  mkdirSync,
  openSync,
  readFileSync,
  readdirSync,
  renameSync,
  statSync,
  unlinkSync,
  writeSync,
} from 'node:fs';
import { join } from 'node:path';
import type { Sample } from '@thermargin/shared';
import type { DeadLetter, FrameTally } from '@thermargin/store';

/** What the spool keeps: one store write that could not happen yet. */
export interface SpoolBatch {
  samples: Sample[];
  letters: DeadLetter[];
  /** Absent in segments spooled before frames were taken. */
  tallies?: FrameTally[];
}

/**
 * A disk queue of batches, one file per batch named by a sequence number, drained oldest first. A batch
 * is written to a temp name, fsynced and renamed, so after a crash a segment is either whole or absent;
 * that is what lets the ingester acknowledge a message once its batch is spooled.
 */
export class Spool {
  private readonly seqs: number[] = [];
  private readonly sizes = new Map<number, number>();
  private next = 0;
  bytes = 0;

  constructor(
    private readonly dir: string,
    /** bytes: above this, `append` refuses (the broker then holds the messages). */
    readonly max_bytes: number,
  ) {
    mkdirSync(dir, { recursive: true });
    for (const name of readdirSync(dir)) {
      const m = /^(\d{12})\.json$/.exec(name);
      if (!m) {
        if (name.endsWith('.tmp')) unlinkSync(join(dir, name)); // a write cut short by a crash: never acked
        continue;
      }
      const seq = Number(m[1]);
      this.seqs.push(seq);
      this.track(seq, statSync(join(dir, name)).size);
    }
    this.seqs.sort((a, b) => a - b);
    this.next = (this.seqs.at(-1) ?? -1) + 1;
  }

  get segments(): number {
    return this.seqs.length;
  }

  get full(): boolean {
    return this.bytes >= this.max_bytes;
  }

  /** Durably appends a batch; false (nothing written) when the spool is full. */
  append(batch: SpoolBatch): boolean {
    if (this.full) return false;
    const seq = this.next++;
    const data = Buffer.from(JSON.stringify(batch));
    const tmp = join(this.dir, `${this.name(seq)}.tmp`);
    const fd = openSync(tmp, 'w');
    try {
      writeSync(fd, data);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, join(this.dir, this.name(seq)));
    this.seqs.push(seq);
    this.track(seq, data.length);
    return true;
  }

  /** The oldest batch, or undefined when the spool is empty. */
  peek(): SpoolBatch | undefined {
    const seq = this.seqs[0];
    if (seq === undefined) return undefined;
    return JSON.parse(readFileSync(join(this.dir, this.name(seq)), 'utf8')) as SpoolBatch;
  }

  /** Removes the oldest batch (after the store took it). */
  shift(): void {
    const seq = this.seqs.shift();
    if (seq === undefined) return;
    unlinkSync(join(this.dir, this.name(seq)));
    this.bytes -= this.sizes.get(seq) ?? 0;
    this.sizes.delete(seq);
  }

  private track(seq: number, size: number): void {
    this.sizes.set(seq, size);
    this.bytes += size;
  }

  private name(seq: number): string {
    return `${String(seq).padStart(12, '0')}.json`;
  }
}
