import { gunzipSync } from 'node:zlib';
import { JsonPage } from '@thermargin/api/json-page';
import { Hono } from 'hono';
import { describe, expect, it } from 'vitest';

describe('JsonPage', () => {
  const json = JSON.stringify({
    vehicles: Array.from({ length: 200 }, (_, i) => ({ id: `bus-${i}`, k: i / 3 })),
  });
  const page = new JsonPage(json);
  const app = new Hono().get('/', (c) => page.respond(c));

  it('answers the JSON with an ETag, and 304 when the client already has it', async () => {
    const r = await app.request('/');
    expect(r.status).toBe(200);
    expect(await r.text()).toBe(json);
    expect(r.headers.get('content-type')).toBe('application/json; charset=utf-8');
    const etag = r.headers.get('etag')!;
    expect(etag).toMatch(/^"[\w-]+"$/);
    expect(new JsonPage(json).etag).toBe(etag);
    const again = await app.request('/', { headers: { 'if-none-match': `"other", W/${etag}` } });
    expect(again.status).toBe(304);
    expect(await again.text()).toBe('');
  });

  it('gzips when the client accepts it, not when it refuses it with q=0', async () => {
    const r = await app.request('/', { headers: { 'accept-encoding': 'br, gzip;q=0.8' } });
    expect(r.headers.get('content-encoding')).toBe('gzip');
    expect(r.headers.get('vary')).toBe('accept-encoding');
    expect(gunzipSync(Buffer.from(await r.arrayBuffer())).toString('utf8')).toBe(json);
    const plain = await app.request('/', { headers: { 'accept-encoding': 'gzip;q=0, br' } });
    expect(plain.headers.get('content-encoding')).toBeNull();
    expect(await plain.text()).toBe(json);
  });
});
