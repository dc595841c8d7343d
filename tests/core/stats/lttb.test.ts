import { lttbIndices } from '@thermargin/core/stats/lttb';
import { describe, expect, it } from 'vitest';

describe('lttbIndices (Steinarsson 2013, largest-triangle-three-buckets)', () => {
  it('the doc example: a lone peak is the point kept from its bucket', () => {
    expect([...lttbIndices([0, 1, 2, 3, 4], [[0, 0, 5, 0, 0]], 3)]).toEqual([0, 2, 4]);
  });

  it('keeps first and last, returns exactly `threshold` ascending indices', () => {
    const n = 10_000;
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const y = x.map((t) => Math.sin(t / 300));
    const idx = lttbIndices(x, [y], 500);
    expect(idx.length).toBe(500);
    expect(idx[0]).toBe(0);
    expect(idx.at(-1)).toBe(n - 1);
    for (let i = 1; i < idx.length; i++) expect(idx[i]!).toBeGreaterThan(idx[i - 1]!);
  });

  it('a one-sample spike survives heavy downsampling, in any of several series', () => {
    const n = 5000;
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const flat = new Float64Array(n);
    const spiky = new Float64Array(n);
    spiky[3210] = 50;
    expect([...lttbIndices(x, [flat, spiky], 100)]).toContain(3210);
  });

  it('NaN values add nothing; fewer points than asked: all of them', () => {
    const idx = lttbIndices([0, 1, 2, 3, 4, 5], [[0, Number.NaN, 9, 0, Number.NaN, 0]], 4);
    expect(idx.length).toBe(4);
    expect([...idx]).toContain(2);
    expect([...lttbIndices([0, 1, 2], [[1, 2, 3]], 10)]).toEqual([0, 1, 2]);
  });
});
