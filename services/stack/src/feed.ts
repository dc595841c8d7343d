import type { Sample } from '@thermargin/shared';
import type { Scenario } from '@thermargin/simulator';
import { progressBar } from './progress-bar.ts';

/**
 * The demo's history, resuming where the store stopped: every sample up to `cut_ms` newer than its
 * vehicle's last stored sample, at full speed with a progress bar; `counted(n)` gets the total at the end.
 */
export async function* historyFeed(
  scenario: Scenario,
  storedTo_ms: ReadonlyMap<string, number>,
  cut_ms: number,
  stop: AbortSignal,
  counted: (samples: number) => void,
): AsyncGenerator<Sample> {
  const from_ms = scenario.history.from_ms;
  const bar = progressBar('history');
  let n = 0;
  for (const s of scenario.fleetSamples({ from_ms, to_ms: cut_ms })) {
    if (stop.aborted) return;
    if (s.time_ms <= (storedTo_ms.get(s.vehicle) ?? Number.NEGATIVE_INFINITY)) continue;
    n++;
    // Let the broker, the ingester and the analyzer in this process run between chunks of generation.
    if ((n & 1023) === 0) await new Promise((r) => setImmediate(r));
    if ((n & 4095) === 0) {
      const f = (s.time_ms - from_ms) / (cut_ms - from_ms);
      // The total is estimated from the share of the history's time already fed.
      const total = f > 0.01 ? ` of about ${(Math.round(n / f / 1e5) / 10).toLocaleString('en-US')} M` : '';
      bar.update(
        f,
        `${n.toLocaleString('en-US')}${total} samples, ${new Date(s.time_ms).toISOString().slice(0, 10)}`,
      );
    }
    yield s;
  }
  bar.done(`${n.toLocaleString('en-US')} samples`);
  counted(n);
}

/**
 * The same physics driving on after `cut_ms`, each sample released when the clock reaches its time.
 * `speedup` > 1 runs the fleet ahead of the clock (the ingester refuses samples more than a day ahead).
 */
export async function* liveFeed(
  scenario: Scenario,
  cut_ms: number,
  o: { speedup: number; now: () => number; stop: AbortSignal },
): AsyncGenerator<Sample> {
  const wall0 = o.now();
  for (const s of scenario.fleetSamples({ from_ms: cut_ms, to_ms: Number.POSITIVE_INFINITY })) {
    const wait = wall0 + (s.time_ms - cut_ms) / o.speedup - o.now();
    if (wait > 0) await sleep(wait, o.stop);
    if (o.stop.aborted) return;
    yield s;
  }
}

/** Resolves after `ms`, or at once when `stop` is aborted. */
function sleep(ms: number, stop: AbortSignal): Promise<void> {
  return new Promise<void>((r) => {
    const wake = () => {
      clearTimeout(t);
      stop.removeEventListener('abort', wake);
      r();
    };
    const t = setTimeout(wake, ms);
    stop.addEventListener('abort', wake);
  });
}
