import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const BIN = join(import.meta.dirname, '../../services/cli/bin/thermargin.mjs');

/** Runs the real `thermargin` bin in a child process, with `env` added to this process's environment. */
export function runCli(
  args: string[],
  env: Record<string, string> = {},
): { code: number; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    encoding: 'utf8',
    maxBuffer: 256 << 20,
    env: { ...process.env, ...env },
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/** A fresh temp folder with the given files written into it. */
export function tempFiles(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-test-'));
  for (const [name, text] of Object.entries(files)) writeFileSync(join(dir, name), text);
  return dir;
}
