import { setTimeout as sleep } from 'node:timers/promises';
import type { Sample } from '@thermargin/shared';
import type { Logger } from '@thermargin/shared/log';
import { type DeadLetter, type FrameTally, type SampleStore, storeFault } from '@thermargin/store';
import type { IngestMetrics } from './metrics.ts';
import type { Spool, SpoolBatch } from './spool.ts';

/** One MQTT message's outcome, with the acknowledgement to send once it is durable. */
export interface Delivery {
  samples: Sample[];
  letters: DeadLetter[];
  /** Frame tallies of a frames message (stored with its samples, before the acknowledgement). */
  tallies?: FrameTally[];
  ack: () => void;
}

export const PIPELINE_DEFAULTS = {
  /** samples: a write starts as soon as this many are pending. */
  batch_samples: 5000,
  /** ms: the longest a delivery waits for others to share its write. */
  linger_ms: 10,
  /** store writes in flight at once (the connections not tied up in one fill the next). */
  max_concurrent_writes: 2,
  /** ms: first and longest wait between attempts to reach the store while it is down. */
  retry_min_ms: 250,
  retry_max_ms: 5000,
};

export type PipelineOptions = typeof PIPELINE_DEFAULTS;

/**
 * Deliveries → store, acknowledging each only once its samples and dead letters are stored or spooled.
 * Writes are grouped: each MQTT connection has one delivery in flight (MQTT.js hands over the next
 * message only after the previous acknowledgement), so a write starts when every connection not already
 * in a write is waiting, when `batch_samples` are pending, or after `linger_ms`; up to
 * `max_concurrent_writes` run at once (order does not matter: writes are idempotent). When the store fails, batches go to the disk
 * spool (and are acknowledged); the spool is drained in order, with backoff, until the store takes them,
 * and new batches join its tail meanwhile. A full spool leaves deliveries unacknowledged, so the broker
 * holds the rest: memory stays bounded by the connections' in-flight windows.
 */
export class Pipeline {
  private pending: Delivery[] = [];
  private pendingSamples = 0;
  private writes = 0;
  /** deliveries inside writes in flight */
  private inWrite = 0;
  private draining = false;
  private storeDown = false;
  private timer: NodeJS.Timeout | undefined;
  private closed = false;
  private idle: (() => void)[] = [];

  constructor(
    private readonly store: SampleStore,
    private readonly spool: Spool,
    private readonly metrics: IngestMetrics,
    private readonly options: PipelineOptions,
    /** how many deliveries can be in flight at once (connections up) */
    private readonly inFlightLimit: () => number,
    private readonly log: Logger,
  ) {
    this.gauges();
    if (spool.segments > 0) this.drain();
  }

  submit(d: Delivery): void {
    this.pending.push(d);
    this.pendingSamples += d.samples.length;
    this.gauges();
    this.schedule();
  }

  /** Writes what is pending and resolves when nothing is left in memory (the spool may still hold some). */
  async flush(): Promise<void> {
    if (this.writes === 0 && this.pending.length === 0) return;
    await new Promise<void>((resolve) => {
      this.idle.push(resolve);
      this.schedule(true);
    });
  }

  /** Stops draining and writing (pending deliveries stay unacknowledged: the broker redelivers them). */
  close(): void {
    this.closed = true;
    clearTimeout(this.timer);
  }

  private schedule(now = false): void {
    if (this.writes >= this.options.max_concurrent_writes || this.closed) return;
    if (this.pending.length === 0) {
      if (this.writes === 0) this.settle();
      return;
    }
    // Every connection not tied up in a write is waiting: nothing more can arrive, so write now.
    const waitingAll = this.pending.length >= Math.max(1, this.inFlightLimit() - this.inWrite);
    const full = this.pendingSamples >= this.options.batch_samples || waitingAll;
    if (now || full) {
      clearTimeout(this.timer);
      this.timer = undefined;
      void this.write();
    } else
      this.timer ??= setTimeout(() => {
        this.timer = undefined;
        this.schedule(true);
      }, this.options.linger_ms);
  }

  private settle(): void {
    for (const resolve of this.idle.splice(0)) resolve();
  }

  private async write(): Promise<void> {
    this.writes++;
    const batch = this.pending.splice(0);
    this.inWrite += batch.length;
    this.pendingSamples = 0;
    const samples = batch.length === 1 ? batch[0]!.samples : batch.flatMap((d) => d.samples);
    const letters = batch.flatMap((d) => d.letters);
    const tallies = batch.flatMap((d) => d.tallies ?? []);
    let durable = false;
    try {
      durable = await this.commit({ samples, letters, tallies });
    } catch (e) {
      this.log('pipeline_error', { error: String(e) });
    }
    if (durable) {
      for (const d of batch) d.ack();
      this.metrics.messages_acked += batch.length;
    } else {
      // Spool full (or unwritable): keep them, unacknowledged, and try again after a pause.
      this.pending.unshift(...batch);
      this.pendingSamples += samples.length;
      await sleep(this.options.retry_max_ms);
    }
    this.writes--;
    this.inWrite -= batch.length;
    this.gauges();
    this.schedule(!durable);
  }

  /** True once durable (stored or spooled). */
  private async commit(batch: SpoolBatch): Promise<boolean> {
    // Behind the spool's batches while it holds some; straight to the spool while the store is down,
    // unless the spool refuses writes too (its own disk full): then the store is tried again.
    const spoolFirst = this.spool.segments > 0 || (this.storeDown && !this.metrics.spool_fault);
    if (spoolFirst) return this.toSpool(batch);
    // Samples and tallies are idempotent, letters are not: letters last, so a retry never repeats one.
    try {
      await this.store.writeSamples(batch.samples);
      await this.store.writeFrameTallies(batch.tallies ?? []);
      this.metrics.samples_stored += batch.samples.length;
      this.recovered();
    } catch (e) {
      this.failed(e);
      return this.toSpool(batch);
    }
    try {
      await this.store.writeDeadLetters(batch.letters);
    } catch (e) {
      this.failed(e);
      return this.toSpool({ samples: [], letters: batch.letters });
    }
    return true;
  }

  private recovered(): void {
    if (this.storeDown) this.log('store_up', { spool_segments: this.spool.segments });
    this.storeDown = false;
    this.metrics.store_up = 1;
    this.metrics.store_fault = null;
  }

  private failed(e: unknown): void {
    this.metrics.store_write_failures++;
    const f = storeFault(e);
    // Said once per change (disk full → read-only …), with the reason: the console shows it.
    if (!this.storeDown || this.metrics.store_fault?.reason !== f.reason)
      this.log('store_down', { kind: f.kind, reason: f.reason });
    this.metrics.store_fault = f;
    this.storeDown = true;
    this.metrics.store_up = 0;
  }

  private toSpool(batch: SpoolBatch): boolean {
    let spooled: boolean;
    try {
      spooled = this.spool.append(batch);
    } catch (e) {
      // Its disk full or read-only too: nothing more is acknowledged until it takes writes again.
      const f = storeFault(e);
      if (this.metrics.spool_fault?.reason !== f.reason)
        this.log('spool_unwritable', { kind: f.kind, reason: f.reason });
      this.metrics.spool_fault = f;
      return false;
    }
    if (!spooled) return false;
    if (this.metrics.spool_fault) this.log('spool_writable', {});
    this.metrics.spool_fault = null;
    this.metrics.spooled_batches++;
    this.gauges();
    this.drain();
    return true;
  }

  private async drain(): Promise<void> {
    if (this.draining) return;
    this.draining = true;
    let delay = this.options.retry_min_ms;
    while (!this.closed && this.spool.segments > 0) {
      const batch = this.spool.peek()!;
      try {
        await this.store.writeSamples(batch.samples);
        await this.store.writeFrameTallies(batch.tallies ?? []);
        await this.store.writeDeadLetters(batch.letters);
      } catch (e) {
        this.failed(e);
        await sleep(delay * (0.5 + Math.random() / 2));
        delay = Math.min(delay * 2, this.options.retry_max_ms);
        continue;
      }
      this.spool.shift();
      this.metrics.samples_stored += batch.samples.length;
      this.metrics.drained_batches++;
      this.recovered();
      delay = this.options.retry_min_ms;
      this.gauges();
    }
    this.draining = false;
  }

  private gauges(): void {
    this.metrics.pending_messages = this.pending.length;
    this.metrics.pending_samples = this.pendingSamples;
    this.metrics.spool_bytes = this.spool.bytes;
    this.metrics.spool_segments = this.spool.segments;
  }
}
