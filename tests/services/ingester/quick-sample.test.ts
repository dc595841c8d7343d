import { quickSample } from '@thermargin/ingester/quick-sample';
import { toSample, wireSampleSchema } from '@thermargin/shared';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

const VEHICLE = 'bus-01';
const base = {
  time: '2025-07-02T10:00:00.500Z',
  vehicle: VEHICLE,
  trip: 'trip-7',
  speed_kmh: 42.5,
  power_kw: -12,
  coolant_in_c: 80,
  coolant_out_c: 71,
  ambient_c: 20,
  fan_pct: 30,
  coolant_flow_lpm: 120,
  derate: 1,
};
const KEYS = Object.keys(base);

/** Values that sit on, inside and just past every rule of the wire schema. */
const awkward = fc.oneof(
  fc.jsonValue(),
  fc.constantFrom(
    -0,
    0,
    1,
    0.5,
    -1,
    250,
    250.0001,
    -2000,
    2001,
    150,
    -60,
    65.1,
    100,
    Number.POSITIVE_INFINITY,
    Number.NaN,
    '',
    '0',
    ' 1751450400000 ',
    '2025-07-02T10:00:00Z',
    '2025-07-02 10:00:00',
    'bus-02',
    'a..b',
    '-lead',
    'x'.repeat(65),
    null,
    true,
    [],
    {},
  ),
);

describe('quickSample (the decoder fast path) against wireSampleSchema', () => {
  it('accepts a well-formed sample, giving what the schema path gives', () => {
    const fast = quickSample(base, VEHICLE);
    expect(fast).toEqual(toSample(wireSampleSchema.parse(base)));
  });

  it('is never more lenient than the schema, and equal to it whenever it answers', () => {
    const mutation = fc.record({
      drop: fc.subarray(KEYS),
      set: fc.dictionary(fc.constantFrom(...KEYS, 'bogus', '__proto__', 'toString'), awkward, {
        maxKeys: 3,
      }),
    });
    fc.assert(
      fc.property(mutation, ({ drop, set }) => {
        const item: Record<string, unknown> = { ...base };
        for (const k of drop) delete item[k];
        for (const [k, v] of Object.entries(set))
          Object.defineProperty(item, k, { value: v, enumerable: true });
        const fast = quickSample(JSON.parse(JSON.stringify(item)), VEHICLE);
        const slow = wireSampleSchema.safeParse(JSON.parse(JSON.stringify(item)));
        if (fast === undefined) return;
        expect(slow.success).toBe(true);
        expect(fast).toEqual(toSample(slow.data!));
        expect(fast.vehicle).toBe(VEHICLE);
      }),
      { numRuns: 5000, seed: 11 },
    );
  });

  it('leaves a sample of another vehicle to the schema path (which names the mismatch)', () => {
    expect(quickSample({ ...base, vehicle: 'bus-02' }, VEHICLE)).toBeUndefined();
  });
});
