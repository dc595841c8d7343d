import { afterAll, describe, expect, it } from 'vitest';
import { drawVariant } from '../../support/forward-model/variants.ts';
import { ErrorTable, recover, TOLERANCE_PCT } from './harness.ts';

/**
 * Twelve scenarios drawn at random (variants.ts: thermal mass, air-side exponent, fin parameter,
 * fan curve, sensor lag, noise, sampling 0.5/1/2 s, ambient, flow meter, fouling), none of them
 * tuned on the estimator. Tolerances are the targets.
 */
const table = new ErrorTable('k recovery, randomly drawn scenarios (seed 2025)');
afterAll(() => table.print());

const variants = Array.from({ length: 12 }, (_, i) => drawVariant(2025, i));

describe('band k recovery on scenarios nobody tuned for', () => {
  it.each(variants)('$label', ({ label, scenario }) => {
    const r = recover(scenario);
    for (const c of [r.ram, r.fan]) {
      const line = table.add(label, c);
      expect(c.truth_s, `scenario: ${line}`).toBeGreaterThanOrEqual(300);
      expect(c.estimated_w_m2k, line).not.toBeNull();
      expect(Math.abs(c.error_pct), line).toBeLessThanOrEqual(TOLERANCE_PCT[c.band]);
    }
  });
});
