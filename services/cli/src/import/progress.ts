/** bytes: inputs smaller than this finish too fast to need a progress line. */
const PROGRESS_MIN_BYTES = 20 * 1024 * 1024;

/** A throttled (once a second) progress line on stderr for large inputs; `now` injectable for tests. */
export function progressReporter(totalBytes: number, now: () => number = Date.now) {
  const enabled = totalBytes >= PROGRESS_MIN_BYTES;
  const tty = process.stderr.isTTY === true;
  let done = 0;
  let last = 0;
  return {
    bytes(n: number, rows: number): void {
      done += n;
      if (!enabled || now() - last < 1000) return;
      last = now();
      const line = `thermargin: read ${(done / 1048576).toFixed(0)} of ${(totalBytes / 1048576).toFixed(0)} MB (${((100 * done) / totalBytes).toFixed(0)} %), ${rows.toLocaleString('en-US')} rows`;
      process.stderr.write(tty ? `\r${line}` : `${line}\n`);
    },
    end(): void {
      if (enabled && tty) process.stderr.write('\n');
    },
  };
}
