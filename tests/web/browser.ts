import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type BrowserContext, chromium, type Page } from 'playwright-core';
import { ROOT } from '../support/web-stack.ts';

/** Debian's chromium (the machine's browser), headless, without background traffic. */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
];

export interface Browser {
  context: BrowserContext;
  /**
   * Console errors and uncaught page errors since the last call, then cleared; those matching `expected`
   * (a refusal a test provokes on purpose) are dropped. Every browser test checks it is empty.
   */
  consoleErrors(expected?: RegExp): string[];
  close(): Promise<void>;
}

/** A browser with a fresh user-data dir, removed on close. */
export async function launchBrowser(): Promise<Browser> {
  const profile = mkdtempSync(join(tmpdir(), 'thermargin-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: { width: 1360, height: 900 },
  });
  let errors: string[] = [];
  const watch = (page: Page) => {
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(`${page.url()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => errors.push(`${page.url()}: ${e.message}`));
  };
  context.pages().forEach(watch);
  context.on('page', watch);
  return {
    context,
    consoleErrors(expected) {
      const seen = errors.filter((e) => !expected?.test(e));
      errors = [];
      return seen;
    },
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Opens the dashboard at `hash` signed in with `token` through the sign-in screen. */
export async function signedIn(
  context: BrowserContext,
  url: string,
  token: string,
  hash = '#/fleet',
): Promise<Page> {
  const page = await context.newPage();
  await page.goto(`${url}/${hash}`);
  await page.getByLabel('API token').fill(token);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.locator('[data-role]').waitFor();
  return page;
}

export const SCREENS_DIR = join(ROOT, 'test-artifacts/screens');

export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(SCREENS_DIR, { recursive: true });
  await page.screenshot({ path: join(SCREENS_DIR, `${name}.png`), fullPage: true });
}
