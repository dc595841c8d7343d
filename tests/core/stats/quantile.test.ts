import { mad } from '@thermargin/core/stats/mad';
import { medianCi95Sorted } from '@thermargin/core/stats/median-ci';
import { median, quantileSorted } from '@thermargin/core/stats/quantile';
import { quantileInPlace } from '@thermargin/core/stats/select';
import * as ss from 'simple-statistics';
import { describe, expect, it } from 'vitest';

describe('quantiles against simple-statistics 7.12.1 (R type 7)', () => {
  it('matches the check values', () => {
    // simple-statistics 7.12.1 (Hyndman & Fan type 7 since 7.9): quantile([1,2,3,4], 0.25) = 1.75; median
    // of the 11-value set = 9; mad = 1.
    expect(quantileSorted([1, 2, 3, 4], 0.25)).toBe(1.75);
    expect(median([3, 6, 7, 8, 8, 9, 10, 13, 15, 16, 20])).toBe(9);
    expect(mad([1, 1, 2, 2, 4, 6, 9])).toBe(1);
  });

  it('agrees with simple-statistics on random data, sorted and by quickselect', () => {
    let seed = 7;
    const rnd = () => {
      seed = (seed * 48271) % 2147483647;
      return seed / 2147483647;
    };
    for (let trial = 0; trial < 50; trial++) {
      const xs = Array.from({ length: 1 + Math.floor(rnd() * 300) }, () => rnd() * 100 - 20);
      for (const p of [0, 0.05, 0.5, 0.95, 1]) {
        const ref = ss.quantile(xs, p);
        expect(quantileSorted(Float64Array.from(xs).sort(), p)).toBeCloseTo(ref, 12);
        expect(quantileInPlace(Float64Array.from(xs), p)).toBeCloseTo(ref, 12);
      }
    }
  });
});

describe('medianCi95Sorted', () => {
  it('gives ranks n/2 ± 1.96·√n/2 (Conover): 1…100 → [40, 61]', () => {
    const xs = Float64Array.from({ length: 100 }, (_, i) => i + 1);
    expect(medianCi95Sorted(xs)).toEqual([40, 61]);
  });
  it('needs at least 6 values', () => {
    expect(medianCi95Sorted([1, 2, 3, 4, 5])).toBeNull();
    expect(medianCi95Sorted([1, 2, 3, 4, 5, 6])).toEqual([1, 6]);
  });
});
