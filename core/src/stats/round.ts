/**
 * x rounded to `digits` decimals, never −0: a small negative figure rounds to −0, which JSON writes as
 * 0, so a figure read back from a store would not equal the one computed. Example: (−0.004, 2) → 0.
 */
export function roundTo(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f + 0;
}
