/** "45 s", "3 min", "1 h 05 min": a duration a reader takes in at a glance. */
export function roughDuration(ms: number): string {
  const s = Math.max(0, Math.round(ms / 1000));
  if (s < 90) return `${s} s`;
  const min = Math.round(s / 60);
  if (min < 90) return `${min} min`;
  return `${Math.floor(min / 60)} h ${String(min % 60).padStart(2, '0')} min`;
}

/**
 * A one-line progress bar on stderr, redrawn at most every 200 ms (plain lines every 5 s when not a
 * terminal), with the time left at the rate so far.
 */
export function progressBar(label: string, now: () => number = Date.now) {
  const tty = process.stderr.isTTY === true;
  const t0 = now();
  let last = 0;
  return {
    update(fraction: number, detail: string): void {
      const t = now();
      if (t - last < (tty ? 200 : 5000)) return;
      last = t;
      const f = Math.min(1, Math.max(0, fraction));
      const bar = `${'#'.repeat(Math.round(f * 30))}${'-'.repeat(30 - Math.round(f * 30))}`;
      const left = f > 0.01 ? ` · about ${roughDuration(((t - t0) * (1 - f)) / f)} left` : '';
      const line = `${label} [${bar}] ${(f * 100).toFixed(0).padStart(3)} % ${detail}${left}`;
      process.stderr.write(tty ? `\r${line}\x1b[K` : `${line}\n`);
    },
    done(detail: string): void {
      const took = roughDuration(now() - t0);
      process.stderr.write(
        `${tty ? '\r' : ''}${label} [${'#'.repeat(30)}] 100 % ${detail} in ${took}${tty ? '\x1b[K' : ''}\n`,
      );
    },
  };
}
