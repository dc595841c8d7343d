/**
 * Seeded pseudo-random numbers for the forward model, so every scenario is reproducible: core's
 * Mulberry32 generator as a bare function, with independent child streams.
 */
import { boxMuller, mulberry32 } from '@thermargin/core/stats/prng';

export { mulberry32 };

export type Rng = () => number;

/** Independent child stream (profile, sensors…) derived from a seed and a stream number. */
export function substream(seed: number, stream: number): Rng {
  return mulberry32((Math.imul(seed >>> 0, 0x9e3779b1) ^ Math.imul(stream + 1, 0x85ebca6b)) >>> 0);
}

export function uniform(rng: Rng, lo: number, hi: number): number {
  return lo + (hi - lo) * rng();
}

/** Standard normal deviate (the cosine half of core's Box–Muller pair; the sine half is dropped). */
export function gaussian(rng: Rng): number {
  return boxMuller(rng)[0];
}
