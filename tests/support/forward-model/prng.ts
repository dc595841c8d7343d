/**
 * Seeded pseudo-random numbers for the forward model, so every scenario is reproducible.
 * mulberry32 (a 32-bit multiply–xorshift generator, public domain, common practice for test data).
 */
export type Rng = () => number;

/** Uniform [0, 1) stream from a 32-bit seed. Example: mulberry32(1)() → 0.6270739405881613. */
export function mulberry32(seed: number): Rng {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Independent child stream (profile, sensors…) derived from a seed and a stream number. */
export function substream(seed: number, stream: number): Rng {
  return mulberry32((Math.imul(seed >>> 0, 0x9e3779b1) ^ Math.imul(stream + 1, 0x85ebca6b)) >>> 0);
}

export function uniform(rng: Rng, lo: number, hi: number): number {
  return lo + (hi - lo) * rng();
}

/** Standard normal deviate by the Box–Muller transform. */
export function gaussian(rng: Rng): number {
  const u = 1 - rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}
