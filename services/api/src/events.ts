import { type ApiEvent, type Status, withoutWindows } from '@thermargin/shared';
import { streamSSE } from 'hono/streaming';
import type { ApiContext } from './context.ts';
import type { Handlers } from './route.ts';
import type { TokenEntry, TokenRegistry } from './tokens.ts';

type Listener = (e: ApiEvent) => void;

/**
 * Live events for every subscriber, found by polling (works whether the analyzer runs in this process
 * or another): results whose version moved give `trip` events for trips not seen before (or changed
 * end) and `status` events; the sample store's newest sample per vehicle gives `sample` events.
 * Polls only while someone listens; the first poll only takes stock.
 */
export class EventHub {
  private readonly listeners = new Set<Listener>();
  private timer: NodeJS.Timeout | undefined;
  private versions = new Map<string, number>();
  private trips = new Map<string, Map<string, string>>();
  private statuses = new Map<string, Status | null>();
  private samples = new Map<string, number>();
  private primed = false;

  constructor(
    private readonly x: ApiContext,
    private readonly poll_ms: number,
  ) {}

  subscribe(l: Listener): () => void {
    this.listeners.add(l);
    if (!this.timer) this.schedule();
    return () => {
      this.listeners.delete(l);
      if (this.listeners.size === 0) this.close();
    };
  }

  close(): void {
    clearTimeout(this.timer);
    this.timer = undefined;
  }

  private schedule(): void {
    this.timer = setTimeout(
      () => {
        this.poll()
          .catch((e) => this.x.deps.log?.('events_poll_failed', { error: String(e) }))
          .finally(() => {
            if (this.listeners.size) this.schedule();
          });
      },
      this.primed ? this.poll_ms : 0,
    );
  }

  private emit(e: ApiEvent): void {
    if (this.primed) for (const l of this.listeners) l(e);
  }

  async poll(): Promise<void> {
    const { results } = this.x.deps;
    for (const [vehicle, v] of await results.versions()) {
      if (this.versions.get(vehicle) === v) continue;
      this.versions.set(vehicle, v);
      const d = await this.x.reader.vehicle(vehicle);
      if (!d) continue;
      const seen = this.trips.get(vehicle) ?? new Map<string, string>();
      for (const t of d.result.trips) {
        if (seen.get(t.trip) !== t.end)
          this.emit({ event: 'trip', data: { vehicle, trip: withoutWindows(t) } });
        seen.set(t.trip, t.end);
      }
      this.trips.set(vehicle, seen);
      const to = d.result.status ?? 'ok';
      const from = this.statuses.get(vehicle) ?? null;
      if (from !== to)
        this.emit({ event: 'status', data: { vehicle, from, to, time: d.result.trips.at(-1)?.end ?? '' } });
      this.statuses.set(vehicle, to);
    }
    for (const s of (await this.x.reader.latest()).values()) {
      if (this.samples.get(s.vehicle) === s.time_ms) continue;
      this.samples.set(s.vehicle, s.time_ms);
      const { vehicle, speed_kmh, power_kw, coolant_in_c, ambient_c, fan_pct } = s;
      this.emit({
        event: 'sample',
        data: {
          vehicle,
          time: new Date(s.time_ms).toISOString(),
          speed_kmh,
          power_kw,
          coolant_in_c,
          ambient_c,
          fan_pct,
        },
      });
    }
    this.primed = true;
  }
}

/** s, 15: a comment line this often keeps proxies from closing an idle stream. */
const KEEPALIVE_MS = 15_000;

export function eventRoutes(hub: EventHub, tokens: TokenRegistry): Handlers<'events'> {
  return {
    events: async ({ c }) => {
      const token = c.get('token' as never) as TokenEntry;
      return streamSSE(c, async (stream) => {
        const queue: ApiEvent[] = [];
        let wake: (() => void) | undefined;
        let revoked = false;
        const off = hub.subscribe((e) => {
          queue.push(e);
          wake?.();
        });
        // Revoked in this process: at once; in another one: seen at the next keep-alive.
        const unwatch = tokens.whenRevoked(token.name, () => {
          revoked = true;
          wake?.();
        });
        stream.onAbort(off);
        try {
          while (!stream.aborted && !revoked) {
            const e = queue.shift();
            if (e) {
              await stream.writeSSE({ event: e.event, data: JSON.stringify(e.data) });
              continue;
            }
            let timer: NodeJS.Timeout | undefined;
            await new Promise<void>((r) => {
              wake = r;
              timer = setTimeout(r, KEEPALIVE_MS);
            });
            clearTimeout(timer);
            wake = undefined;
            revoked ||= !(await tokens.isListed(token.sha256));
            if (!queue.length && !stream.aborted && !revoked) await stream.write(': keep-alive\n\n');
          }
          if (revoked && !stream.aborted)
            await stream.writeSSE({ event: 'revoked', data: JSON.stringify({ token: token.name }) });
        } finally {
          off();
          unwatch();
        }
      });
    },
  };
}
