import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { headEnd, lowerBound, tailStart } from '../../shared/src/array-index.ts';

describe('array index helpers mirror the Array methods they replace', () => {
  const sortedArray = fc
    .array(fc.integer({ min: -50, max: 50 }), { maxLength: 40 })
    .map((a) => a.sort((x, y) => x - y));
  it('lowerBound(a, x) is where a.filter(v => v >= x) starts', () => {
    fc.assert(
      fc.property(sortedArray, fc.integer({ min: -60, max: 60 }), (a, x) => {
        const i = lowerBound(a, x);
        expect(a.slice(i)).toEqual(a.filter((v) => v >= x));
      }),
    );
  });
  it('tailStart and headEnd give arr.slice(-k) and arr.slice(0, k), odd k included', () => {
    const k = fc.oneof(fc.integer({ min: -50, max: 50 }), fc.double({ min: -50, max: 50, noNaN: true }));
    fc.assert(
      fc.property(fc.array(fc.integer(), { maxLength: 30 }), k, (arr, kk) => {
        expect(arr.slice(tailStart(arr.length, kk))).toEqual(arr.slice(-kk));
        expect(arr.slice(0, headEnd(arr.length, kk))).toEqual(arr.slice(0, kk));
      }),
    );
  });
});
