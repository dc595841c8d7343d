import { readDecimal } from '@thermargin/cli/import/decimal';
import { fastTime_ms } from '@thermargin/cli/import/iso-time';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

/** The parsers read Latin-1 bytes of a field, as the CSV reader hands them. */
const bytes = (s: string) => Buffer.from(s, 'latin1');
const decimal = (s: string) => readDecimal(bytes(s), 0, s.length);
const time_ms = (s: string) => fastTime_ms(bytes(s), 0, s.length);

describe('readDecimal agrees with Number() (ECMAScript StringToNumber, the reference)', () => {
  it('on arbitrary doubles printed plainly and with fixed decimals', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 6 }), (x, d) => {
        const s = x.toFixed(d);
        expect(decimal(s)).toBe(Number(s));
      }),
      { numRuns: 5000 },
    );
  });
  it('on edge cases: empty is missing, text is NaN, exponents and long mantissas fall back', () => {
    expect(decimal('')).toBeUndefined();
    expect(decimal('   ')).toBeUndefined();
    expect(decimal(' 12.5 ')).toBe(12.5);
    expect(decimal('-0.03125')).toBe(-0.03125);
    expect(decimal('1e3')).toBe(1000);
    expect(decimal('12345678901234567890')).toBe(Number('12345678901234567890'));
    expect(decimal('abc')).toBeNaN();
    expect(decimal('NaN')).toBeNaN();
    expect(decimal('1.2.3')).toBeNaN();
    expect(decimal('-')).toBeNaN();
  });
});

describe('fastTime_ms agrees with Date.parse', () => {
  it('on arbitrary instants 2000–2100 with and without milliseconds', () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2100, 0, 1) }), (t) => {
        const iso = new Date(t).toISOString();
        expect(time_ms(iso)).toBe(t);
        const noMs = `${iso.slice(0, 19)}Z`;
        expect(time_ms(noMs)).toBe(Date.parse(noMs));
      }),
      { numRuns: 5000 },
    );
  });
  it('refuses impossible dates and takes other ISO forms and epoch ms through the general parser', () => {
    expect(time_ms('2026-02-30T00:00:00Z')).toBeNaN();
    expect(time_ms('2025-02-29T00:00:00Z')).toBeNaN();
    expect(time_ms('2024-02-29T00:00:00Z')).toBe(Date.UTC(2024, 1, 29));
    expect(time_ms('2026-07-01T25:00:00Z')).toBeNaN();
    expect(time_ms('2026-07-01Tab:00:00Z')).toBeNaN();
    expect(time_ms('2026-07-01T08:00:00+00:00')).toBe(Date.UTC(2026, 6, 1, 8));
    expect(time_ms('1782892800000')).toBe(1782892800000);
    expect(time_ms('yesterday')).toBeNaN();
  });
});
