import { Worker } from 'node:worker_threads';
import { parseVehicleTopic, type VehicleTopic } from '@thermargin/shared';
import type { Logger } from '@thermargin/shared/log';
import { type DecodeContext, type Decoded, safeDecode } from './decode.ts';
import { type PackedSamples, unpackSamples } from './sample-pack.ts';
import type { VehicleMapSpec } from './vehicle-readings.ts';

export interface DecodeWorkerData {
  known_vehicles: string[];
  max_payload_bytes: number;
  /** The fleet file's mappings and reference torques; each worker builds its readings from them. */
  vehicle_maps: [string, VehicleMapSpec][];
}
export interface DecodeJob {
  id: number;
  topic: string;
  /** the topic as the receiving thread read it */
  parsed: VehicleTopic | undefined;
  payload: Uint8Array;
  now_ms: number;
}
export interface DecodeResult extends Omit<Decoded, 'samples'> {
  id: number;
  samples: PackedSamples;
}

interface Pending {
  topic: string;
  parsed: VehicleTopic | undefined;
  payload: Buffer;
  now_ms: number;
  resolve: (d: Decoded) => void;
}
interface Slot {
  worker: Worker;
  jobs: Map<number, Pending>;
  /** the worker loaded and said so: one that dies before that is not replaced */
  online: boolean;
}

/**
 * Decoding (JSON.parse, validation) on worker threads, so the thread that speaks MQTT and writes the
 * store spends its time on those. The payload bytes are copied once and transferred; the samples come
 * back packed (sample-pack.ts). A worker that dies hands its jobs back to the main thread, which decodes
 * them itself, and is replaced — unless it died before starting, then the pool decodes inline from
 * there on. Decoding never fails a message: the worst case is the inline path.
 */
export class DecodePool {
  private readonly slots: Slot[] = [];
  private seq = 0;
  private closed = false;
  private readonly data: DecodeWorkerData;

  constructor(
    size: number,
    private readonly ctx: Omit<DecodeContext, 'now_ms'>,
    private readonly log: Logger,
    vehicle_maps: ReadonlyMap<string, VehicleMapSpec> = new Map(),
  ) {
    this.data = {
      known_vehicles: [...ctx.known_vehicles],
      max_payload_bytes: ctx.max_payload_bytes,
      vehicle_maps: [...vehicle_maps],
    };
    for (let i = 0; i < size; i++) this.slots.push(this.spawn());
  }

  /** `parsed`: the topic read already, when the caller has read it. */
  decode(
    topic: string,
    payload: Buffer,
    now_ms: number,
    parsed: VehicleTopic | undefined = parseVehicleTopic(topic),
  ): Promise<Decoded> {
    const slot = this.slots.reduce<Slot | undefined>(
      (best, s) => (!best || s.jobs.size < best.jobs.size ? s : best),
      undefined,
    );
    if (!slot) return Promise.resolve(this.inline({ topic, parsed, payload, now_ms }));
    const id = this.seq++;
    return new Promise((resolve) => {
      slot.jobs.set(id, { topic, parsed, payload, now_ms, resolve });
      const bytes = new Uint8Array(payload); // only this message's bytes, not the socket buffer under it
      const job: DecodeJob = { id, topic, parsed, payload: bytes, now_ms };
      slot.worker.postMessage(job, [bytes.buffer]);
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    await Promise.all(this.slots.map((s) => s.worker.terminate()));
  }

  private inline(job: Omit<Pending, 'resolve'>): Decoded {
    return safeDecode(job.topic, job.payload, { ...this.ctx, now_ms: job.now_ms }, job.parsed);
  }

  private spawn(): Slot {
    const worker = new Worker(new URL('./decode-worker-entry.mjs', import.meta.url), {
      workerData: this.data,
    });
    const slot: Slot = { worker, jobs: new Map(), online: false };
    worker.on('message', (r: DecodeResult | 'ready') => {
      if (r === 'ready') {
        slot.online = true;
        return;
      }
      const job = slot.jobs.get(r.id);
      slot.jobs.delete(r.id);
      job?.resolve({
        samples: unpackSamples(r.samples),
        rejects: r.rejects,
        refused: r.refused,
        tallies: r.tallies,
      });
    });
    worker.on('error', (e) => this.log('decode_worker_error', { error: e.message }));
    worker.on('exit', (code) => {
      for (const job of slot.jobs.values()) job.resolve(this.inline(job));
      slot.jobs.clear();
      const i = this.slots.indexOf(slot);
      if (this.closed || i < 0) return;
      if (slot.online) this.slots[i] = this.spawn();
      else this.slots.splice(i, 1);
      this.log('decode_worker_exit', { code, replaced: slot.online });
    });
    return slot;
  }
}
