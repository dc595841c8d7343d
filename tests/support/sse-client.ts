/** One server-sent event as received. */
export interface SseEvent {
  event: string;
  data: string;
  id: string | undefined;
}

/**
 * A client of GET /api/events that behaves as a browser's EventSource: when its stream breaks it
 * reconnects, here to the next of `urls` (another API replica), sending Last-Event-ID.
 */
export class SseClient {
  readonly events: SseEvent[] = [];
  reconnects = 0;
  private lastId: string | undefined;
  private stopped = false;
  private abort = new AbortController();
  private at: number;
  private readonly done: Promise<void>;
  private markConnected: () => void = () => {};
  /** Resolves once the first connection has answered (the stream is open). */
  readonly connected: Promise<void> = new Promise((r) => {
    this.markConnected = r;
  });

  constructor(
    private readonly urls: readonly string[],
    private readonly token: string,
    first = 0,
  ) {
    this.at = first;
    this.done = this.run();
  }

  private async run(): Promise<void> {
    while (!this.stopped) {
      try {
        const r = await fetch(`${this.urls[this.at % this.urls.length]}/api/events`, {
          headers: {
            authorization: `Bearer ${this.token}`,
            ...(this.lastId ? { 'last-event-id': this.lastId } : {}),
          },
          signal: this.abort.signal,
        });
        if (r.status !== 200 || !r.body) throw new Error(`HTTP ${r.status}`);
        this.markConnected();
        let buffer = '';
        const decoder = new TextDecoder();
        const reader = r.body.getReader();
        for (;;) {
          const { done, value } = await reader.read();
          if (done) break;
          buffer += decoder.decode(value, { stream: true });
          let cut = buffer.indexOf('\n\n');
          while (cut >= 0) {
            this.parse(buffer.slice(0, cut));
            buffer = buffer.slice(cut + 2);
            cut = buffer.indexOf('\n\n');
          }
        }
      } catch {
        // broken stream or refused connection: reconnect below
      }
      if (this.stopped) return;
      this.reconnects++;
      this.at++;
      await new Promise((r) => setTimeout(r, 200));
    }
  }

  private parse(block: string): void {
    const e: SseEvent = { event: 'message', data: '', id: undefined };
    let any = false;
    for (const line of block.split('\n')) {
      if (line.startsWith(':')) continue;
      const i = line.indexOf(':');
      const field = i < 0 ? line : line.slice(0, i);
      const value = i < 0 ? '' : line.slice(i + 1).replace(/^ /, '');
      if (field === 'event') e.event = value;
      else if (field === 'data') e.data += value;
      else if (field === 'id') e.id = value;
      else continue;
      any = true;
    }
    if (!any) return;
    if (e.id !== undefined) this.lastId = e.id;
    this.events.push(e);
  }

  async close(): Promise<void> {
    this.stopped = true;
    this.abort.abort();
    await this.done;
  }
}
