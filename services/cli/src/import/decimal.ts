import { decimalNumber } from '@thermargin/shared';

/**
 * Reads a plain decimal number (`-12.345`, or `-12,345` with a decimal comma: `point` 44; spaces around
 * allowed) from the Latin-1 bytes s[a, b)
 * without making a string. Exact: digits ≤ 15 and a power of ten ≤ 10²² are exact doubles, so one
 * division rounds correctly, as Number() does. Anything else (exponents, long mantissas, text) goes
 * through decimalNumber (decimal notation only: `0x10` is not 16); returns NaN for text that is not a
 * decimal number and undefined for an empty cell.
 */
export function readDecimal(s: Buffer, a: number, b: number, point = 46): number | undefined {
  while (a < b && s[a] === 32) a++;
  while (b > a && s[b - 1] === 32) b--;
  if (a === b) return undefined;
  let i = a;
  let neg = false;
  const c0 = s[i]!;
  if (c0 === 45 || c0 === 43) {
    neg = c0 === 45;
    i++;
  }
  let mant = 0;
  let digits = 0;
  let scale = 0;
  let dot = false;
  for (; i < b; i++) {
    const c = s[i]!;
    if (c >= 48 && c <= 57) {
      mant = mant * 10 + (c - 48);
      digits++;
      if (dot) scale++;
    } else if (c === point && !dot) dot = true;
    else return point === 46 ? decimalNumber(s.toString('latin1', a, b)) : Number.NaN;
  }
  if (digits === 0 || digits > 15 || scale > 22)
    return decimalNumber(s.toString('latin1', a, b).replace(String.fromCharCode(point), '.'));
  const x = scale ? mant / 10 ** scale : mant;
  return neg ? -x : x;
}
