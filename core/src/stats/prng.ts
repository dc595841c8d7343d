/**
 * Seeded pseudo-random numbers, so that core and every generator built on it stay deterministic
 * (no Math.random): Mulberry32 (T. Ettinger, public-domain 32-bit generator, period 2³²) for
 * uniforms, Box & Muller (1958) for standard normals. Example: uniform stream of seed 1 starts
 * 0.6270739405881613.
 */
export interface Rng {
  /** Uniform on [0, 1). */
  next(): number;
  /** Uniform on [lo, hi); [0, 1) by default. */
  uniform(lo?: number, hi?: number): number;
  /** Integer uniform on [lo, hi] inclusive. */
  int(lo: number, hi: number): number;
  /** Standard normal N(0, 1). */
  normal(): number;
  /** True with probability p. */
  chance(p: number): boolean;
}

/** Mulberry32 as a bare [0, 1) function. Example: mulberry32(1)() = 0.6270739405881613. */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Box–Muller transform of two uniform draws from `next` (first u₁, then u₂) into two independent
 * standard normals [r·cos θ, r·sin θ], r = √(−2 ln(1 − u₁)), θ = 2π·u₂.
 */
export function boxMuller(next: () => number): [number, number] {
  const r = Math.sqrt(-2 * Math.log(1 - next()));
  const th = 2 * Math.PI * next();
  return [r * Math.cos(th), r * Math.sin(th)];
}

export function createRng(seed: number): Rng {
  const next = mulberry32(seed);
  let spare: number | null = null;
  return {
    next,
    uniform: (lo = 0, hi = 1) => lo + (hi - lo) * next(),
    int: (lo, hi) => lo + Math.floor((hi - lo + 1) * next()),
    normal: () => {
      if (spare !== null) {
        const s = spare;
        spare = null;
        return s;
      }
      const [z, z2] = boxMuller(next);
      spare = z2;
      return z;
    },
    chance: (p) => next() < p,
  };
}

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

/**
 * A stream keyed by a seed and named parts (vehicle, day, purpose), so that adding one key does not
 * shift the draws of any other.
 */
export function streamFor(seed: number, ...parts: (string | number)[]): Rng {
  return createRng(hashKey(seed, ...parts));
}
