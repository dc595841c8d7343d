import type { CommunicationObserver, SendOptions, Transport } from '@influxdata/influxdb-client';

/**
 * InfluxDB 1.x compatibility for the v2 client: InfluxDB 1.8+ serves `/api/v2/write` itself (the client's
 * documented 1.8 mode: token `user:password`, bucket `db/rp`), but 1.6 and 1.7 only serve `/write`. This
 * transport rewrites the client's write path to the 1.x endpoint, so batching, retries and back-pressure
 * stay the client's own. Reads use InfluxQL over `/query`, which every targeted version serves.
 */
export function v1Transport(
  inner: Transport,
  credentials?: { username: string; password: string },
): Transport {
  const rewrite = (path: string): string => {
    if (!path.startsWith('/api/v2/write?')) return path;
    const q = new URLSearchParams(path.slice('/api/v2/write?'.length));
    const [db = '', rp] = (q.get('bucket') ?? '').split('/');
    const out = new URLSearchParams({ db, precision: q.get('precision') ?? 'ns' });
    if (rp) out.set('rp', rp);
    return `/write?${out}`;
  };
  const withAuth = (options: SendOptions): SendOptions => {
    if (!credentials) return options;
    const basic = Buffer.from(`${credentials.username}:${credentials.password}`).toString('base64');
    return { ...options, headers: { ...options.headers, authorization: `Basic ${basic}` } };
  };
  return {
    send(
      path: string,
      body: string,
      options: SendOptions,
      callbacks?: Partial<CommunicationObserver<Uint8Array>>,
    ) {
      inner.send(rewrite(path), body, withAuth(options), callbacks);
    },
    request(path, body, options, responseStarted) {
      return inner.request(rewrite(path), body, withAuth(options), responseStarted);
    },
    iterate(path, body, options) {
      return inner.iterate(rewrite(path), body, withAuth(options));
    },
    chunkCombiner: inner.chunkCombiner,
  };
}
