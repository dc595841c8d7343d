import { describe, expect, it } from 'vitest';
import { roundTo } from '../../../core/src/stats/round.ts';

describe('roundTo', () => {
  it('rounds to the decimals asked', () => {
    expect(roundTo(2.34567, 2)).toBe(2.35);
    expect(roundTo(1234.5678, 1)).toBe(1234.6);
  });

  it('never gives −0, which a store would read back as 0', () => {
    expect(Object.is(roundTo(-0.004, 2), 0)).toBe(true);
    expect(JSON.parse(JSON.stringify({ x: roundTo(-0.004, 2) }))).toEqual({ x: roundTo(-0.004, 2) });
  });
});
