import { createHash } from 'node:crypto';
import { gzipSync } from 'node:zlib';
import type { Context } from 'hono';
import type { Answer } from './route.ts';

type Body = Uint8Array<ArrayBuffer>;

/**
 * A large JSON answer kept encoded between changes: the bytes, an ETag of them, and a gzip copy made
 * on the first request that accepts it. A hit is a buffer write (or a 304 when the client has it).
 */
export class JsonPage<T = unknown> {
  readonly etag: string;
  private readonly raw: Body;
  private gzip: Body | undefined;

  constructor(json: string) {
    this.raw = Buffer.from(json, 'utf8') as Body;
    this.etag = `"${createHash('sha256').update(this.raw).digest('base64url').slice(0, 27)}"`;
  }

  /** The page of `body`, typed as it. */
  static of<T>(body: T): JsonPage<T> {
    return new JsonPage<T>(JSON.stringify(body));
  }

  respond(c: Context): Answer<T> {
    return this.response(c) as Answer<T>;
  }

  private response(c: Context): Response {
    const headers: Record<string, string> = {
      'content-type': 'application/json; charset=utf-8',
      etag: this.etag,
      vary: 'accept-encoding',
      // Answers depend on the token's access: a shared cache must not keep them, a browser revalidates.
      'cache-control': 'private, no-cache',
    };
    if (ifNoneMatch(c.req.header('if-none-match'), this.etag))
      return new Response(null, { status: 304, headers });
    if (!acceptsGzip(c.req.header('accept-encoding'))) return new Response(this.raw, { headers });
    this.gzip ??= gzipSync(this.raw) as Body;
    return new Response(this.gzip, { headers: { ...headers, 'content-encoding': 'gzip' } });
  }
}

const ifNoneMatch = (header: string | undefined, etag: string) =>
  !!header?.split(',').some((t) => t.trim().replace(/^W\//, '') === etag || t.trim() === '*');

/** True when `gzip` is listed without `q=0` (RFC 9110 §12.5.3). */
function acceptsGzip(header: string | undefined): boolean {
  if (!header) return false;
  return header.split(',').some((part) => {
    const [coding = '', ...params] = part.split(';').map((s) => s.trim().toLowerCase());
    const q = params.find((p) => p.startsWith('q='));
    return (coding === 'gzip' || coding === '*') && (q === undefined || Number(q.slice(2)) > 0);
  });
}
