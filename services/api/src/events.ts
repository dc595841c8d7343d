import { type ApiEvent, type Status, withoutWindows } from '@thermargin/shared';
import { streamSSE } from 'hono/streaming';
import type { ResultChange, ResultChanges } from '@thermargin/store/changes';
import type { ApiContext } from './context.ts';
import type { Handlers } from './route.ts';
import type { TokenEntry, TokenRegistry } from './tokens.ts';

/** An event with, where results are numbered (PostgreSQL), the change and place a client resumes after. */
export type HubEvent = ApiEvent & { change?: { id: number; index: number } };

const changeEvent = (c: ResultChange): HubEvent => {
  const change = { id: c.id, index: c.index };
  return c.kind === 'trip'
    ? { event: 'trip', data: { vehicle: c.vehicle, trip: withoutWindows(c.trip) }, change }
    : { event: 'status', data: { vehicle: c.vehicle, from: c.from, to: c.to, time: c.time }, change };
};
type Listener = (e: HubEvent) => void;

/**
 * Live events for every subscriber, found by polling (works whether the analyzer runs in this process
 * or another): the sample store's newest sample per vehicle gives `sample` events. `trip` and `status`
 * events: on PostgreSQL from the numbered changes (every commit by any analyzer, woken at once by its
 * notification, each event carrying its change id); on SQLite from results whose version moved (trips
 * not seen before or with a changed end, a status other than the one seen). Polls only while someone
 * listens; the first poll only takes stock.
 */
export class EventHub {
  private readonly listeners = new Set<Listener>();
  private timer: NodeJS.Timeout | undefined;
  private versions = new Map<string, number>();
  private trips = new Map<string, Map<string, string>>();
  private statuses = new Map<string, Status | null>();
  private samples = new Map<string, number>();
  private primed = false;
  private readonly primedOnce: Promise<void>;
  private markPrimed: () => void = () => {};
  private unlisten: (() => void) | undefined;
  /** The newest change id whose trips have been told (PostgreSQL). */
  lastChange = 0;

  constructor(
    private readonly x: ApiContext,
    private readonly poll_ms: number,
  ) {
    this.primedOnce = new Promise((r) => {
      this.markPrimed = r;
    });
  }

  /** Resolves once the first poll has taken stock (lastChange is then the newest change). */
  ready(): Promise<void> {
    return this.primedOnce;
  }

  subscribe(l: Listener): () => void {
    this.listeners.add(l);
    if (!this.timer) this.schedule(this.primed ? this.poll_ms : 0);
    this.unlisten ??= this.x.deps.changes?.subscribe(() => this.schedule(0));
    return () => {
      this.listeners.delete(l);
      if (this.listeners.size === 0) this.close();
    };
  }

  close(): void {
    clearTimeout(this.timer);
    this.timer = undefined;
    this.unlisten?.();
    this.unlisten = undefined;
  }

  private polling = false;
  private again = false;

  private schedule(ms: number): void {
    if (this.polling) {
      this.again ||= ms === 0; // a notification during a poll: poll once more right after
      return;
    }
    clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.polling = true;
      this.poll()
        .catch((e) => this.x.deps.log?.('events_poll_failed', { error: String(e) }))
        .finally(() => {
          this.polling = false;
          const again = this.again;
          this.again = false;
          if (this.listeners.size) this.schedule(again ? 0 : this.poll_ms);
          else this.timer = undefined;
        });
    }, ms);
  }

  private emit(e: HubEvent): void {
    if (this.primed) for (const l of this.listeners) l(e);
  }

  /** Trip and status events of the changes after lastChange, in order. */
  private async pollChanges(changes: ResultChanges): Promise<void> {
    if (!this.primed) {
      this.lastChange = await changes.latest();
      return;
    }
    for (;;) {
      const list = await changes.since(this.lastChange);
      for (const c of list) {
        this.emit(changeEvent(c));
        this.lastChange = c.id;
      }
      if (list.length === 0) return;
    }
  }

  /** Trip and status events of the results whose version moved (SQLite: no numbered changes). */
  private async pollVersions(): Promise<void> {
    for (const [vehicle, v] of await this.x.deps.results.versions()) {
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
  }

  async poll(): Promise<void> {
    const { changes } = this.x.deps;
    if (changes) await this.pollChanges(changes);
    else await this.pollVersions();
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
    if (!this.primed) this.markPrimed();
    this.primed = true;
  }
}

/** s, 15: a comment line this often keeps proxies from closing an idle stream. */
const KEEPALIVE_MS = 15_000;

/** The trips and status changes a client missed: after place `index` of change `id` up to change
 *  `upTo`, in order. */
async function missed(
  changes: ResultChanges,
  after: { id: number; index: number },
  upTo: number,
): Promise<HubEvent[]> {
  const out: HubEvent[] = [];
  for (let from = after.id - 1; from < upTo; ) {
    const list = (await changes.since(from)).filter((c) => c.id <= upTo);
    if (list.length === 0) break;
    for (const c of list) if (c.id > after.id || c.index > after.index) out.push(changeEvent(c));
    from = list.at(-1)!.id;
  }
  return out;
}

/** `<change>-<index>`, the id of a trip or status event. */
const RESUME_ID = /^(\d+)-(\d+)$/;

export function eventRoutes(
  hub: EventHub,
  tokens: TokenRegistry,
  changes: ResultChanges | undefined,
): Handlers<'events'> {
  return {
    events: async ({ c }) => {
      const token = c.get('token' as never) as TokenEntry;
      return streamSSE(c, async (stream) => {
        const queue: HubEvent[] = [];
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
        const write = (e: HubEvent) =>
          stream.writeSSE({
            event: e.event,
            data: JSON.stringify(e.data),
            ...(e.change ? { id: `${e.change.id}-${e.change.index}` } : {}),
          });
        try {
          const resume = RESUME_ID.exec(c.req.header('last-event-id') ?? '');
          // What this client has been told: changes up to `caughtUp`, and up to its resume point.
          let caughtUp = 0;
          const after = { id: Number(resume?.[1] ?? 0), index: Number(resume?.[2] ?? 0) };
          if (changes && resume) {
            await hub.ready();
            caughtUp = hub.lastChange;
            for (const e of await missed(changes, after, caughtUp)) await write(e);
          }
          const told = ({ id, index }: { id: number; index: number }) =>
            id <= caughtUp || id < after.id || (id === after.id && index <= after.index);
          let listedAt = Date.now();
          while (!stream.aborted && !revoked) {
            const e = queue.shift();
            if (e) {
              if (!e.change || !told(e.change)) await write(e);
              continue;
            }
            let timer: NodeJS.Timeout | undefined;
            await new Promise<void>((r) => {
              wake = r;
              timer = setTimeout(r, KEEPALIVE_MS);
            });
            clearTimeout(timer);
            wake = undefined;
            if (Date.now() - listedAt >= KEEPALIVE_MS) {
              // A store that cannot say (closing at shutdown, or down) ends the stream, failing
              // closed: the client resumes from its Last-Event-ID once the API answers again.
              const listed = await tokens.isListed(token.sha256).catch(() => undefined);
              if (listed === undefined) break;
              revoked ||= !listed;
              listedAt = Date.now();
            }
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
