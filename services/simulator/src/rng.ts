/**
 * Seeded pseudo-random numbers: every draw in the simulator comes from one of these, never from
 * Math.random(), so a scenario is a pure function of its seed. Streams are keyed by name (vehicle,
 * day, purpose) so that adding a vehicle or a day does not shift the draws of any other.
 */

/** 32-bit FNV-1a hash of the parts, joined by '/'. Example: hashKey('a') = 0xe40c292c. */
export function hashKey(...parts: (string | number)[]): number {
  let h = 0x811c9dc5;
  const s = parts.join('/');
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [lo, hi). */
  uniform(lo: number, hi: number): number;
  /** Integer uniform in [lo, hi] inclusive. */
  int(lo: number, hi: number): number;
  /** Standard normal (Box–Muller). */
  normal(): number;
  /** True with probability p. */
  chance(p: number): boolean;
}

/** A stream from a 32-bit state: the splitmix32 generator (Steele, Lea & Flood 2014, 32-bit variant). */
export function createRng(seed: number): Rng {
  let state = seed >>> 0;
  let spare: number | null = null;
  const next = (): number => {
    state = (state + 0x9e3779b9) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    z ^= z >>> 16;
    return (z >>> 0) / 4294967296;
  };
  return {
    next,
    uniform: (lo, hi) => lo + (hi - lo) * next(),
    int: (lo, hi) => lo + Math.floor((hi - lo + 1) * next()),
    normal: () => {
      if (spare !== null) {
        const s = spare;
        spare = null;
        return s;
      }
      const u = 1 - next();
      const r = Math.sqrt(-2 * Math.log(u));
      const th = 2 * Math.PI * next();
      spare = r * Math.sin(th);
      return r * Math.cos(th);
    },
    chance: (p) => next() < p,
  };
}

/** A stream named by the scenario seed and the parts. */
export function streamFor(seed: number, ...parts: (string | number)[]): Rng {
  return createRng(hashKey(seed, ...parts));
}
