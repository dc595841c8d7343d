import type { BrokerRefusal } from '@thermargin/shared';
import type { DeadLetter, SampleStore } from '@thermargin/store';

const FLUSH_MS = 1000;

/**
 * Records a broker's refusals (the embedded broker's hooks, or Mosquitto's log) as refused messages of
 * the store, each naming its client id: the refused-data screen then counts them per vehicle (the user
 * name) and reason beside the ingester's. Written once a second, so a client retrying a wrong password
 * in a loop costs one write a second.
 */
export function brokerRefusals(vehicles: ReadonlySet<string>) {
  let pending: DeadLetter[] = [];
  let sink: Pick<SampleStore, 'writeDeadLetters'> | undefined;
  const flush = async () => {
    if (!sink || !pending.length) return;
    const batch = pending;
    pending = [];
    await sink.writeDeadLetters(batch).catch(() => {});
  };
  const timer = setInterval(() => void flush(), FLUSH_MS);
  timer.unref();
  return {
    onRefused(r: BrokerRefusal): void {
      pending.push({
        received_ms: r.time_ms,
        vehicle: vehicles.has(r.username) ? r.username : '',
        reason: r.reason,
        detail: `client id ${r.client_id || '(none)'}${r.username ? `, user ${r.username}` : ''}: ${r.detail}`,
        topic: r.topic,
        excerpt: '',
        payload_bytes: 0,
      });
    },
    /** Where to write from now on (the store may open after the broker starts). */
    writeTo(s: Pick<SampleStore, 'writeDeadLetters'>): void {
      sink = s;
    },
    async close(): Promise<void> {
      clearInterval(timer);
      await flush();
    },
  };
}
