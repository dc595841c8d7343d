import { describe, expect, it } from 'vitest';
import { ambientOffset } from '../../../core/src/trip/ambient-offset.ts';

describe('ambient offset from key-on soak checks', () => {
  it('a steady offset on six checks is confirmed (the module example)', () => {
    expect(ambientOffset([-1.1, -0.9, -1.0, -1.2, -0.8, -1.0])).toEqual({
      value_k: -1,
      ci95: [-1.2, -0.8],
      checks: 6,
      applied: true,
      reason: null,
    });
  });
  it('fewer than six checks: estimated, not applied', () => {
    const a = ambientOffset([-1, -1.1, -0.9]);
    expect(a.applied).toBe(false);
    expect(a.reason).toMatch(/3 soak checks, need 6/);
  });
  it('a sensor that stepped is not steady: left to the health module', () => {
    const a = ambientOffset([0, 0.1, -0.1, 0, 3, 3.1, 2.9, 3.2]);
    expect(a.applied).toBe(false);
    expect(a.reason).toMatch(/not steady/);
  });
  it('checks about zero: the interval includes it', () => {
    expect(ambientOffset([0.2, -0.3, 0.1, -0.1, 0.4, -0.2, 0]).reason).toMatch(/includes zero/);
  });
  it('a small offset is left alone', () => {
    expect(ambientOffset([0.2, 0.22, 0.18, 0.21, 0.19, 0.2]).reason).toMatch(/below 0.3 K/);
  });
  it('no checks', () => {
    expect(ambientOffset([])).toMatchObject({ value_k: null, checks: 0, applied: false });
  });
});
