import { execFileSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** A small filesystem of its own, to fill up or make read-only under a running service. */
export interface SmallDisk {
  dir: string;
  /** Takes every free byte (a filler file), so the next write fails with ENOSPC. */
  fill(): void;
  /** Removes the filler. */
  free(): void;
  /** Remounts it read-only (rw: back to writable). */
  remount(mode: 'ro' | 'rw'): void;
  /** Unmounts and removes the mount point. */
  close(): void;
}

const FILLER = '.filler';

/**
 * A tmpfs of `bytes` mounted on a temp dir (needs root and a kernel that lets this container mount),
 * or the reason it cannot be had here, for the test to skip with.
 */
export function mountSmallDisk(bytes: number): SmallDisk | string {
  if (process.getuid?.() !== 0) return 'mounting a small tmpfs needs root';
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-small-disk-'));
  try {
    execFileSync('mount', ['-t', 'tmpfs', '-o', `size=${bytes}`, 'tmpfs', dir], { stdio: 'pipe' });
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    return `mount -t tmpfs failed: ${(e as Error).message.split('\n')[0]}`;
  }
  let mounted = true;
  const close = () => {
    if (!mounted) return;
    mounted = false;
    process.off('exit', close);
    execFileSync('umount', ['-l', dir], { stdio: 'pipe' });
    rmSync(dir, { recursive: true, force: true });
  };
  // The run's temp root is removed at the end: never with a filesystem still mounted in it.
  process.once('exit', close);
  return {
    dir,
    fill() {
      const fd = openSync(join(dir, FILLER), 'a');
      try {
        for (const size of [1 << 20, 1 << 12, 1]) {
          const chunk = Buffer.alloc(size);
          try {
            for (;;) writeSync(fd, chunk);
          } catch (e) {
            if ((e as NodeJS.ErrnoException).code !== 'ENOSPC') throw e;
          }
        }
      } finally {
        closeSync(fd);
      }
    },
    free() {
      rmSync(join(dir, FILLER), { force: true });
    },
    remount(mode) {
      execFileSync('mount', ['-o', `remount,${mode}`, dir], { stdio: 'pipe' });
    },
    close,
  };
}
