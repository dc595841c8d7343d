import type { Sample } from '@thermargin/shared';

export interface PaceOptions {
  /** –, 1: simulated seconds per wall-clock second. */
  speedup: number;
  /** Wall clock, epoch ms (injected; Date.now in production). */
  now: () => number;
  /** Waits `ms` (injected; a timer in production). */
  sleep: (ms: number) => Promise<void>;
}

export const PACE_DEFAULTS: Readonly<PaceOptions> = Object.freeze({
  speedup: 1,
  now: () => Date.now(),
  sleep: (ms: number) => new Promise<void>((r) => setTimeout(r, ms)),
});

/**
 * Releases time-ordered samples at the pace of the simulated clock: the sample at sim time t goes out at
 * wall time w0 + (t − t0) / speedup, w0 and t0 taken at the first sample. With speedup 1 and a stream
 * starting now (liveSamples(Date.now())) sample times track the wall clock; with a speed-up they run
 * ahead of it, so receivers that reject future times (the contract allows up to 24 h) limit the run.
 */
export async function* paceSamples(
  samples: Iterable<Sample>,
  options: Partial<PaceOptions> = {},
): AsyncGenerator<Sample> {
  const o = { ...PACE_DEFAULTS, ...options };
  if (!(o.speedup > 0)) throw new RangeError(`paceSamples: speedup must be > 0, got ${o.speedup}`);
  let w0 = Number.NaN;
  let t0 = 0;
  for (const s of samples) {
    if (Number.isNaN(w0)) {
      w0 = o.now();
      t0 = s.time_ms;
    }
    const due = w0 + (s.time_ms - t0) / o.speedup;
    const wait = due - o.now();
    if (wait > 0) await o.sleep(wait);
    yield s;
  }
}
