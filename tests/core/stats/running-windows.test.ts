import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { shiftStart } from '../../../core/src/stats/change-point.ts';
import { RunningDiffSigma, sigmaFromDifferences } from '../../../core/src/stats/diff-sigma.ts';

const finite = fc.double({ min: -1e3, max: 1e3, noNaN: true, noDefaultInfinity: true });

describe('RunningDiffSigma: the incremental σ equals the batch one', () => {
  it('Δx [1, 2, 3, 4] → 1.4826 · MAD 1 / √2 = 1.04836 (the doc-comment example)', () => {
    const r = new RunningDiffSigma();
    for (const d of [3, 1, 4, 2]) r.push(d);
    expect(r.sigma()).toBeCloseTo(1.04836, 5);
    expect(r.sigma()).toBe(sigmaFromDifferences([1, 2, 3, 4]));
  });
  it('after every push, on any order and with ties, exactly sigmaFromDifferences of what was pushed', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(finite, fc.integer({ min: -3, max: 3 })), { minLength: 2, maxLength: 60 }),
        (xs) => {
          const r = new RunningDiffSigma();
          xs.forEach((x, i) => {
            r.push(x);
            if (i >= 1) expect(r.sigma()).toBe(sigmaFromDifferences(xs.slice(0, i + 1)));
          });
          expect(r.length).toBe(xs.length);
        },
      ),
    );
  });
  it('fewer than two differences is an error that says so', () => {
    const r = new RunningDiffSigma();
    r.push(1);
    expect(() => r.sigma()).toThrow(/needs ≥ 2 differences, got 1/);
  });
});

describe('shiftStart (Hinkley 1971 change-point estimate)', () => {
  it('x [1, 1, 1, 0, 0], μ0 1 → 3 (the doc-comment example)', () => {
    expect(shiftStart([1, 1, 1, 0, 0], 1, 0)).toBe(3);
  });
  it('a step after a wandering stretch is found at the step, not at the stretch start', () => {
    const x = [1, 0.97, 0.98, 0.97, 0.99, 0.96, 0.55, 0.57, 0.56];
    expect(shiftStart(x, 1, 0)).toBe(6);
  });
  it('equals a brute-force argmax of (Σ_{i≥j}(x_i − μ0))² / (n − j), ties to the earliest j', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: -5, max: 5 }), { minLength: 1, maxLength: 30 }),
        fc.nat(),
        (x, f) => {
          const from = f % x.length;
          let best = from;
          let bestScore = Number.NEGATIVE_INFINITY;
          for (let j = from; j < x.length; j++) {
            const s = x.slice(j).reduce((a, v) => a + v, 0);
            const score = (s * s) / (x.length - j);
            if (score > bestScore) {
              bestScore = score;
              best = j;
            }
          }
          expect(shiftStart(x, 0, from)).toBe(best);
        },
      ),
    );
  });
  it('a start outside the series is an error that names it', () => {
    expect(() => shiftStart([1, 2], 0, 2)).toThrow(/from 2 outside the series of 2 points/);
  });
});
