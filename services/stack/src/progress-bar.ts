/** A one-line progress bar on stderr, redrawn at most every 200 ms; plain lines when not a terminal. */
export function progressBar(label: string, now: () => number = Date.now) {
  const tty = process.stderr.isTTY === true;
  let last = 0;
  return {
    update(fraction: number, detail: string): void {
      const t = now();
      if (t - last < (tty ? 200 : 5000)) return;
      last = t;
      const f = Math.min(1, Math.max(0, fraction));
      const bar = `${'#'.repeat(Math.round(f * 30))}${'-'.repeat(30 - Math.round(f * 30))}`;
      const line = `${label} [${bar}] ${(f * 100).toFixed(0).padStart(3)} % ${detail}`;
      process.stderr.write(tty ? `\r${line}` : `${line}\n`);
    },
    done(detail: string): void {
      process.stderr.write(`${tty ? '\r' : ''}${label} [${'#'.repeat(30)}] 100 % ${detail}\n`);
    },
  };
}
