import { describe, expect, it } from 'vitest';
import { effectiveness, type FlowArrangement } from '@thermargin/core/radiator/effectiveness';

const NTUS = [0.5, 1, 2, 3, 5] as const;
const ALL: FlowArrangement[] = [
  'counterflow',
  'parallel',
  'crossflow_unmixed',
  'crossflow_unmixed_series',
  'crossflow_cmax_mixed',
  'crossflow_cmin_mixed',
];

describe('effectiveness: ε-NTU closed forms (Incropera & DeWitt Table 11.3; Kays & London)', () => {
  // Computed from the same closed forms (Incropera & DeWitt Table 11.3), printed to 4 decimals: 1e-4.
  const TABLE: [FlowArrangement, number, number[]][] = [
    ['counterflow', 0.5, [0.3623, 0.5647, 0.7746, 0.8744, 0.9572]],
    ['counterflow', 1, [0.3333, 0.5, 0.6667, 0.75, 0.8333]],
    ['parallel', 1, [0.3161, 0.4323, 0.4908, 0.4988, 0.5]],
    ['crossflow_unmixed', 0.5, [0.3519, 0.5448, 0.7388, 0.8284, 0.9053]],
    ['crossflow_unmixed', 1, [0.3154, 0.4685, 0.6154, 0.6842, 0.749]],
    ['crossflow_unmixed_series', 0.5, [0.3578, 0.5475, 0.7324, 0.8197, 0.9017]],
    ['crossflow_unmixed_series', 1, [0.3263, 0.4762, 0.6142, 0.6813, 0.7509]],
    ['crossflow_cmax_mixed', 0.5, [0.3572, 0.542, 0.702, 0.7564, 0.7828]],
    ['crossflow_cmin_mixed', 0.5, [0.3575, 0.5448, 0.7175, 0.7885, 0.8405]],
    ['crossflow_cmax_mixed', 1, [0.3253, 0.4685, 0.5788, 0.6133, 0.6296]],
    ['crossflow_cmin_mixed', 1, [0.3253, 0.4685, 0.5788, 0.6133, 0.6296]],
  ];
  for (const [arrangement, c, row] of TABLE) {
    it(`${arrangement}, C = ${c}`, () => {
      NTUS.forEach((ntu, i) => {
        expect(Math.abs(effectiveness(arrangement, ntu, c) - row[i]!)).toBeLessThanOrEqual(1e-4);
      });
    });
  }

  it('C = 0 gives 1 − e^(−NTU) for every arrangement', () => {
    const row = [0.3935, 0.6321, 0.8647, 0.9502, 0.9933];
    for (const a of ALL) {
      NTUS.forEach((ntu, i) => {
        expect(Math.abs(effectiveness(a, ntu, 0) - row[i]!)).toBeLessThanOrEqual(1e-4);
      });
    }
  });

  it('EES example UA 75 W/K, C 50 and 30 W/K (NTU 2.5, C 0.6) → 0.7632 with the approximate form (FOUND)', () => {
    expect(effectiveness('crossflow_unmixed', 2.5, 0.6)).toBeCloseTo(0.7632, 4);
    // The exact series gives 0.7557 (computed).
    expect(effectiveness('crossflow_unmixed_series', 2.5, 0.6)).toBeCloseTo(0.7557, 4);
  });

  it('approximate and series unmixed forms agree within 0.012 for NTU ≤ 5 (0.013 by NTU 8)', () => {
    for (const c of [0.1, 0.25, 0.5, 0.75, 1]) {
      for (const ntu of [0.1, 0.25, 0.5, 1, 2, 3, 4, 5]) {
        const gap =
          effectiveness('crossflow_unmixed', ntu, c) - effectiveness('crossflow_unmixed_series', ntu, c);
        expect(Math.abs(gap)).toBeLessThanOrEqual(0.012);
      }
    }
  });

  it('limits: C → 0 and C → 1 are continuous; NTU 0 → 0; ε stays within 0…1 and never falls with NTU', () => {
    for (const a of ALL) {
      expect(effectiveness(a, 0, 0.5)).toBe(0);
      expect(effectiveness(a, 2, 1e-9)).toBeCloseTo(effectiveness(a, 2, 0), 6);
      expect(effectiveness(a, 2, 1 - 1e-9)).toBeCloseTo(effectiveness(a, 2, 1), 6);
      let last = 0;
      for (const ntu of [0.01, 0.1, 1, 10, 100, 1000]) {
        const e = effectiveness(a, ntu, 0.7);
        expect(e).toBeGreaterThanOrEqual(last);
        expect(e).toBeLessThanOrEqual(1);
        last = e;
      }
    }
    expect(effectiveness('parallel', 1000, 0.7)).toBeCloseTo(1 / 1.7, 12);
  });

  it('counterflow at C = 1 is NTU / (1 + NTU)', () => {
    expect(effectiveness('counterflow', 4, 1)).toBe(0.8);
  });

  it('rejects NTU and C outside their range', () => {
    expect(() => effectiveness('counterflow', -1, 0.5)).toThrow(/effectiveness: ntu/);
    expect(() => effectiveness('counterflow', Number.POSITIVE_INFINITY, 0.5)).toThrow(/ntu/);
    expect(() => effectiveness('parallel', 1, 1.5)).toThrow(/c_ratio must be within 0…1/);
    expect(() => effectiveness('parallel', 1, Number.NaN)).toThrow(RangeError);
  });
});
