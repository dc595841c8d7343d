import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { serveDashboard } from '@thermargin/api/static';
import { Hono } from 'hono';
import { describe, expect, it } from 'vitest';
import { tempDir } from '../ingester/support.ts';

describe('the dashboard files', () => {
  const dist = tempDir('dist');
  mkdirSync(join(dist, 'assets'));
  writeFileSync(join(dist, 'index.html'), '<!doctype html><title>t</title>');
  writeFileSync(join(dist, 'assets', 'app.js'), 'export {}');
  const app = new Hono();
  serveDashboard(app, dist);

  it('serves files, and index.html for the screens (SPA paths)', async () => {
    const js = await app.request('/assets/app.js');
    expect([js.status, js.headers.get('content-type')]).toEqual([200, 'text/javascript; charset=utf-8']);
    const screen = await app.request('/vehicles/bus-01');
    expect([screen.status, await screen.text()]).toEqual([200, '<!doctype html><title>t</title>']);
  });

  it('a missing script or file is a 404, not the page (was index.html with 200)', async () => {
    for (const path of ['/assets/missing.js', '/assets/x', '/favicon.ico', '/../../etc/passwd.txt'])
      expect((await app.request(path)).status, path).toBe(404);
  });
});
