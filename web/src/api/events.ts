import type { ApiEvent } from '@thermargin/shared/api';
import { API_ROUTES } from '@thermargin/shared/api-routes';

export type LiveState = 'connecting' | 'live' | 'retrying';

const RETRY_MS = 3000;

/** Splits an SSE byte stream into `event:`/`data:` frames (the keep-alive comment lines are skipped). */
export function sseFrames(buffer: string): { frames: ApiEvent[]; rest: string } {
  const frames: ApiEvent[] = [];
  const blocks = buffer.split(/\r?\n\r?\n/);
  const rest = blocks.pop() ?? '';
  for (const block of blocks) {
    let event = 'message';
    const data: string[] = [];
    for (const line of block.split(/\r?\n/)) {
      if (line.startsWith('event:')) event = line.slice(6).trim();
      else if (line.startsWith('data:')) data.push(line.slice(5).trimStart());
    }
    if (!data.length) continue;
    try {
      frames.push({ event, data: JSON.parse(data.join('\n')) } as ApiEvent);
    } catch {
      // A frame that is not JSON is not one of ours: skip it.
    }
  }
  return { frames, rest };
}

/**
 * The API's server-sent events (`GET /api/events`). EventSource cannot send the bearer header the API
 * requires, so the stream is read through fetch; it reconnects after a drop. Returns the stop function.
 */
export function subscribeEvents(
  token: string,
  onEvent: (e: ApiEvent) => void,
  onState: (s: LiveState) => void,
): () => void {
  const abort = new AbortController();
  const run = async () => {
    while (!abort.signal.aborted) {
      onState('connecting');
      try {
        const res = await fetch(API_ROUTES.events.path, {
          headers: { authorization: `Bearer ${token}`, accept: 'text/event-stream' },
          signal: abort.signal,
        });
        if (!res.ok || !res.body) throw new Error(`events: ${res.status}`);
        onState('live');
        const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
        let buffer = '';
        for (;;) {
          const { value, done } = await reader.read();
          if (done) break;
          const { frames, rest } = sseFrames(buffer + value);
          buffer = rest;
          frames.forEach(onEvent);
        }
      } catch {
        if (abort.signal.aborted) return;
      }
      onState('retrying');
      await new Promise((r) => setTimeout(r, RETRY_MS));
    }
  };
  void run();
  return () => abort.abort();
}
