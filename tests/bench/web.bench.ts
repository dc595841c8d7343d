/**
 * `npm run bench:web`: the dashboard's production bundle size (gzip), and in Debian's chromium the first
 * render of the margin overview with 1 000 vehicles and of a trip trace with 20 000 points per signal, and the
 * frame time while zooming six linked charts of 100 000 points each. The built dashboard is served by the
 * API's own static handler; the API answers are synthetic (tests/bench/web-fixtures.ts), routed in the
 * browser, so the figures are the page's own. Prints figures; asserts nothing.
 */
import { spawnSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { serveDashboard } from '@thermargin/api/static';
import { serve } from '@hono/node-server';
import { Hono } from 'hono';
import type { BrowserContext, Page } from 'playwright-core';
import { ROOT } from '../support/web-stack.ts';
import { launchBrowser } from '../web/browser.ts';
import { syntheticFleet, syntheticTrace } from './web-fixtures.ts';

const DIST = join(ROOT, 'web/dist');
const TOKEN = 'bench-viewer-token-0001';
const ZOOM_STEPS = 30;

function build(): void {
  const vite = join(ROOT, 'node_modules/vite/bin/vite.js');
  const r = spawnSync(process.execPath, [vite, 'build', join(ROOT, 'web'), '--logLevel', 'warn'], {
    stdio: 'inherit',
  });
  if (r.status !== 0) throw new Error('vite build web failed');
}

function bundleSizes(): void {
  const files = ['index.html', ...readdirSync(join(DIST, 'assets')).map((f) => `assets/${f}`)];
  let raw = 0;
  let gz = 0;
  for (const f of files) {
    const bytes = readFileSync(join(DIST, f));
    const g = gzipSync(bytes, { level: 9 }).length;
    raw += bytes.length;
    gz += g;
    console.log(
      `  ${f.padEnd(34)} ${(bytes.length / 1024).toFixed(1).padStart(7)} kB   gzip ${(g / 1024).toFixed(1).padStart(6)} kB`,
    );
  }
  console.log(
    `bundle: ${(raw / 1024).toFixed(1)} kB, gzip (level 9) ${(gz / 1024).toFixed(1)} kB (target ≤ 120 kB)`,
  );
}

/** Answers the dashboard's API calls in the browser: the role probe says viewer, the stream stays empty. */
async function routeApi(context: BrowserContext, trace: ReturnType<typeof syntheticTrace>): Promise<void> {
  const fleet = JSON.stringify(syntheticFleet(1000));
  const traceBody = JSON.stringify(trace);
  const json = (body: string, status = 200) => ({ status, contentType: 'application/json', body });
  await context.route('**/api/**', (route) => {
    const path = new URL(route.request().url()).pathname;
    if (path === '/api/me') return route.fulfill(json('{"name":"bench","role":"viewer"}'));
    if (path === '/api/status') return route.fulfill(json('{}'));
    if (path === '/api/fleet') return route.fulfill(json(fleet));
    if (/\/trips\/[^/]+$/.test(path)) return route.fulfill(json(traceBody));
    if (path === '/api/events')
      return route.fulfill({ status: 200, contentType: 'text/event-stream', body: '' });
    return route.fulfill(json('{"error":{"code":"forbidden","message":"bench: viewer"}}', 403));
  });
  await context.addInitScript((t) => sessionStorage.setItem('thermargin.token', t), TOKEN);
}

const markAt = (page: Page, name: string) =>
  page
    .waitForFunction((n) => performance.getEntriesByName(n)[0]?.startTime, name, { timeout: 120_000 })
    .then((h) => h.jsonValue());

async function firstRender(
  context: BrowserContext,
  url: string,
  hash: string,
  mark: string,
): Promise<number> {
  const page = await context.newPage();
  await page.goto(`${url}/${hash}`);
  const ms = (await markAt(page, mark)) as number;
  await page.close();
  return ms;
}

/** ms per zoom step (setScale on one chart, linked to all, until the next frame has been painted). */
async function zoomFrames(context: BrowserContext, url: string): Promise<number[]> {
  const page = await context.newPage();
  await page.goto(`${url}/#/trip/bench-0001/T1?points=20000`);
  await markAt(page, 'trip:rendered');
  const times = await page.evaluate(async (steps) => {
    const charts = window.__thermargin!.charts;
    const u = charts['trip-speed-power']!;
    const xs = u.data[0];
    const lo = xs[0]!;
    const hi = xs[xs.length - 1]!;
    const out: number[] = [];
    for (let i = 0; i < steps; i++) {
      const f = (i + 1) / (steps + 1);
      const t0 = performance.now();
      u.setScale('x', { min: lo + (hi - lo) * f * 0.45, max: hi - (hi - lo) * f * 0.45 });
      // Two frames: the one that paints the new scale, and the next (the paint has finished).
      for (let k = 0; k < 2; k++) await new Promise((r) => requestAnimationFrame(r));
      out.push(performance.now() - t0);
    }
    return out;
  }, ZOOM_STEPS);
  await page.close();
  return times;
}

const stats = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return `median ${s[Math.floor(s.length / 2)]!.toFixed(1)} ms, p90 ${s[Math.floor(s.length * 0.9)]!.toFixed(1)} ms, max ${s.at(-1)!.toFixed(1)} ms`;
};

async function main(): Promise<void> {
  build();
  bundleSizes();
  const app = new Hono();
  serveDashboard(app, DIST);
  const server = serve({ fetch: app.fetch, port: 0, hostname: '127.0.0.1' });
  await new Promise<void>((r) => server.once('listening', r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  try {
    for (const [label, points] of [
      ['20 000', 20_000],
      ['100 000', 100_000],
    ] as const) {
      const browser = await launchBrowser();
      await routeApi(browser.context, syntheticTrace(points));
      if (points === 20_000) {
        const fleet = [];
        for (let i = 0; i < 3; i++)
          fleet.push(await firstRender(browser.context, url, '#/fleet', 'fleet:rendered'));
        console.log(
          `margin overview, 1 000 vehicles: first render at ${fleet.map((m) => m.toFixed(0)).join(' / ')} ms after navigation`,
        );
      }
      const trip = [];
      for (let i = 0; i < 3; i++)
        trip.push(
          await firstRender(browser.context, url, '#/trip/bench-0001/T1?points=20000', 'trip:rendered'),
        );
      console.log(
        `trip trace, ${label} points × 14 signals, 6 linked charts: first render at ${trip.map((m) => m.toFixed(0)).join(' / ')} ms after navigation`,
      );
      if (points === 100_000)
        console.log(
          `zoom, ${ZOOM_STEPS} steps on 6 linked charts of 100 000 points: per step until painted ${stats(await zoomFrames(browser.context, url))}`,
        );
      await browser.close();
    }
  } finally {
    server.close();
  }
}

await main();
