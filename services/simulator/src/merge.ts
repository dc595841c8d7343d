import type { Sample } from '@thermargin/shared';

/**
 * Merges time-ordered sample streams into one, in time order (ties in source order). A linear scan over
 * the heads: a fleet has tens of vehicles, where a heap would not pay for itself.
 */
export function* mergeByTime(sources: Iterable<Sample>[]): Generator<Sample> {
  const its = sources.map((s) => s[Symbol.iterator]());
  const pull = (i: number): Sample | undefined => {
    const r = its[i]!.next();
    return r.done ? undefined : r.value;
  };
  const heads = its.map((_, i) => pull(i));
  for (;;) {
    let best = -1;
    let bestT = Number.POSITIVE_INFINITY;
    for (let i = 0; i < heads.length; i++) {
      const h = heads[i];
      if (h !== undefined && h.time_ms < bestT) {
        best = i;
        bestT = h.time_ms;
      }
    }
    if (best < 0) return;
    yield heads[best]!;
    heads[best] = pull(best);
  }
}
