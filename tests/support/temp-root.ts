import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Vitest global setup: one temp root for the whole run, set as TMPDIR so every test file, helper
 * and server it starts (influxd, mosquitto, chromium, the CLI) puts its files under it, and
 * removed at the end. Test processes can be stopped without their exit hooks running, and a run
 * leaves ≈ 2 GB behind, enough to fill a small CI disk.
 */
export function setup(): () => void {
  const root = mkdtempSync(join(tmpdir(), 'thermargin-run-'));
  process.env.TMPDIR = root;
  return () => rmSync(root, { recursive: true, force: true });
}
