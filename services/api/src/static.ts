import { existsSync, readFileSync, statSync } from 'node:fs';
import { extname, join, normalize, sep } from 'node:path';
import type { Hono } from 'hono';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.map': 'application/json',
};

/**
 * Serves the built dashboard from `dist` for every GET outside /api: a file when one matches (never
 * outside `dist`), else index.html (the SPA's own router takes over) — except for a path naming a file
 * (an extension, or under /assets/), which is a 404: a page asking for a missing script must fail,
 * not be handed the page itself.
 */
export function serveDashboard(app: Hono, dist: string): void {
  const root = normalize(dist);
  const index = join(root, 'index.html');
  if (!existsSync(index)) return;
  app.get('*', async (c, next) => {
    if (c.req.path === '/api' || c.req.path.startsWith('/api/')) return next();
    let rel: string;
    try {
      rel = decodeURIComponent(c.req.path);
    } catch {
      return next();
    }
    const file = normalize(join(root, rel));
    const inside = file.startsWith(root + sep);
    const found = inside && existsSync(file) && statSync(file).isFile();
    if (!found && (rel.startsWith('/assets/') || extname(rel) !== '')) return next();
    const target = found ? file : index;
    const type = TYPES[extname(target)] ?? 'application/octet-stream';
    const cache = target === index ? 'no-cache' : 'public, max-age=3600';
    return c.body(readFileSync(target), 200, { 'content-type': type, 'cache-control': cache });
  });
}
