import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

/** ms: newest modification time of anything below `dir`. */
function newest(dir: string): number {
  if (!existsSync(dir)) return 0;
  let t = statSync(dir).mtimeMs;
  for (const e of readdirSync(dir, { withFileTypes: true }))
    t = Math.max(t, e.isDirectory() ? newest(join(dir, e.name)) : statSync(join(dir, e.name)).mtimeMs);
  return t;
}

/**
 * Builds the dashboard with Vite when web/dist is missing or older than web/src or web/index.html, so
 * `npm start` needs no build step.
 */
export function ensureWebBuilt(root: string, log: (line: string) => void): void {
  const page = join(root, 'web/index.html');
  if (!existsSync(page)) return;
  const built = join(root, 'web/dist/index.html');
  const source = Math.max(newest(join(root, 'web/src')), statSync(page).mtimeMs);
  if (existsSync(built) && statSync(built).mtimeMs >= source) return;
  log('building the dashboard (vite build web) …');
  const vite = join(root, 'node_modules/vite/bin/vite.js');
  const r = spawnSync(process.execPath, [vite, 'build', join(root, 'web'), '--logLevel', 'warn'], {
    stdio: 'inherit',
  });
  if (r.status !== 0) log('the dashboard build failed (vite build web): the API runs without it');
}
