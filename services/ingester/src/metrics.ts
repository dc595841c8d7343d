import { type Server, createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { type RejectReason, STORE_FAULTS } from '@thermargin/shared';
import { FRAME_TALLY_COUNTS, type FrameTally, type StoreFault } from '@thermargin/store';

/** The ingester's counters and gauges, rendered in the Prometheus text format on GET /metrics. */
export class IngestMetrics {
  messages_received = 0;
  messages_acked = 0;
  samples_received = 0;
  samples_stored = 0;
  store_write_failures = 0;
  spooled_batches = 0;
  drained_batches = 0;
  broker_reconnects = 0;
  /** gauges, set by their owners */
  pending_samples = 0;
  pending_messages = 0;
  spool_bytes = 0;
  spool_segments = 0;
  store_up = 1;
  /** Why the store, and the spool, last refused a write (null while they take them). */
  store_fault: StoreFault | null = null;
  spool_fault: StoreFault | null = null;
  connections_up = 0;
  private readonly rejected = new Map<string, number>();
  /** Per vehicle, the frame tallies of the frames messages received (a redelivery counts again here). */
  private readonly frames = new Map<string, Record<string, number>>();

  /** Samples built from frames but left out for a required signal missing (counted, not refused). */
  get samples_incomplete(): number {
    let n = 0;
    for (const f of this.frames.values()) n += f.incomplete!;
    return n;
  }

  frameTally(t: FrameTally): void {
    let f = this.frames.get(t.vehicle);
    if (!f) this.frames.set(t.vehicle, (f = Object.fromEntries(FRAME_TALLY_COUNTS.map((c) => [c, 0]))));
    for (const c of FRAME_TALLY_COUNTS) f[c]! += t[c];
  }

  reject(vehicle: string, reason: RejectReason, n = 1): void {
    const key = `${vehicle}\u0000${reason}`;
    this.rejected.set(key, (this.rejected.get(key) ?? 0) + n);
  }

  /** Rejections per vehicle ('' when none could be read) and reason. */
  rejections(): { vehicle: string; reason: RejectReason; count: number }[] {
    return [...this.rejected].map(([key, count]) => {
      const [vehicle = '', reason] = key.split('\u0000');
      return { vehicle, reason: reason as RejectReason, count };
    });
  }

  get rejected_total(): number {
    let n = 0;
    for (const c of this.rejected.values()) n += c;
    return n;
  }

  render(): string {
    const out: string[] = [];
    const metric = (name: string, type: 'counter' | 'gauge', help: string, value: number) =>
      out.push(
        `# HELP thermargin_ingest_${name} ${help}`,
        `# TYPE thermargin_ingest_${name} ${type}`,
        `thermargin_ingest_${name} ${value}`,
      );
    metric('messages_received_total', 'counter', 'MQTT messages received', this.messages_received);
    metric(
      'messages_acked_total',
      'counter',
      'MQTT messages acknowledged after durable storage or spooling',
      this.messages_acked,
    );
    metric('samples_received_total', 'counter', 'valid samples received', this.samples_received);
    metric(
      'samples_stored_total',
      'counter',
      'samples written to the store (directly or drained from the spool)',
      this.samples_stored,
    );
    metric(
      'store_write_failures_total',
      'counter',
      'store writes that failed (their batch was spooled)',
      this.store_write_failures,
    );
    metric('spooled_batches_total', 'counter', 'batches written to the disk spool', this.spooled_batches);
    metric('drained_batches_total', 'counter', 'spooled batches written to the store', this.drained_batches);
    metric('broker_reconnects_total', 'counter', 'MQTT reconnect attempts', this.broker_reconnects);
    metric('pending_samples', 'gauge', 'samples in memory waiting for a write', this.pending_samples);
    metric(
      'pending_messages',
      'gauge',
      'messages in memory waiting for their acknowledgement',
      this.pending_messages,
    );
    metric('spool_bytes', 'gauge', 'bytes in the disk spool', this.spool_bytes);
    metric('spool_segments', 'gauge', 'batches in the disk spool', this.spool_segments);
    metric('store_up', 'gauge', '1 when the last store write succeeded', this.store_up);
    for (const [name, fault, what] of [
      ['store_fault', this.store_fault, 'the store refuses writes'],
      ['spool_fault', this.spool_fault, 'the disk spool refuses writes (nothing more is acknowledged)'],
    ] as const) {
      out.push(
        `# HELP thermargin_ingest_${name} 1 for the reason ${what}`,
        `# TYPE thermargin_ingest_${name} gauge`,
      );
      for (const kind of STORE_FAULTS)
        out.push(`thermargin_ingest_${name}{kind="${kind}"} ${fault?.kind === kind ? 1 : 0}`);
    }
    metric('connections_up', 'gauge', 'MQTT connections currently up', this.connections_up);
    metric('heap_used_bytes', 'gauge', 'V8 heap in use', process.memoryUsage().heapUsed);
    out.push(
      '# HELP thermargin_ingest_rejected_total messages or samples dead-lettered, by vehicle and reason',
    );
    out.push('# TYPE thermargin_ingest_rejected_total counter');
    for (const r of this.rejections()) {
      out.push(`thermargin_ingest_rejected_total{vehicle="${r.vehicle}",reason="${r.reason}"} ${r.count}`);
    }
    out.push(
      '# HELP thermargin_ingest_frames_total CAN frames received, decoded and of unknown PGNs, values not available or error, samples built and incomplete, by vehicle',
    );
    out.push('# TYPE thermargin_ingest_frames_total counter');
    for (const [vehicle, f] of this.frames)
      for (const c of FRAME_TALLY_COUNTS)
        out.push(`thermargin_ingest_frames_total{vehicle="${vehicle}",count="${c}"} ${f[c]}`);
    return `${out.join('\n')}\n`;
  }
}

/** GET /metrics (Prometheus text) and GET /healthz on plain node:http. */
export async function startMetricsServer(
  metrics: IngestMetrics,
  port: number,
  host: string,
): Promise<Server> {
  const server = createServer((req, res) => {
    if (req.method === 'GET' && req.url === '/metrics') {
      res.writeHead(200, { 'content-type': 'text/plain; version=0.0.4' }).end(metrics.render());
    } else if (req.method === 'GET' && req.url === '/healthz') {
      const { store_fault: store, spool_fault: spool } = metrics;
      // 503 only when nothing can be acknowledged: store down and the spool refusing too.
      const text = !store
        ? 'ok\n'
        : `store down: ${store.reason}; ${spool ? `spool refuses writes too: ${spool.reason}` : 'spooling to disk'}\n`;
      res.writeHead(store && spool ? 503 : 200, { 'content-type': 'text/plain' }).end(text);
    } else {
      res.writeHead(404, { 'content-type': 'text/plain' }).end('not found: GET /metrics or /healthz\n');
    }
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  return server;
}

export function serverPort(server: Server): number {
  return (server.address() as AddressInfo).port;
}
