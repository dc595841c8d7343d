/** Requests allowed per key: a token bucket refilled at `per_minute`, holding up to `burst`. */
export const RATE_LIMIT_DEFAULTS = {
  /** requests per minute, 600, per token (or per IP without one). */
  per_minute: 600,
  /** requests, 120: the bucket's size, so a page's burst of requests goes through. */
  burst: 120,
  /** keys kept, 10 000: the oldest are forgotten beyond it (bounded memory under a spray of IPs). */
  max_keys: 10_000,
  /**
   * 4: each client address also has a bucket of this many times the rate and burst, taken before any
   * token is looked at (several users behind one proxy share an address).
   */
  address_factor: 4,
};

export type RateLimitOptions = typeof RATE_LIMIT_DEFAULTS;

export class RateLimiter {
  private readonly buckets = new Map<string, { tokens: number; at_ms: number }>();

  constructor(
    private readonly o: Pick<RateLimitOptions, 'per_minute' | 'burst' | 'max_keys'>,
    private readonly clock: () => number,
  ) {}

  /** 0 when the request may go; else seconds to wait. */
  take(key: string): number {
    const now = this.clock();
    const rate_ms = this.o.per_minute / 60_000;
    let b = this.buckets.get(key);
    if (b) this.buckets.delete(key);
    else b = { tokens: this.o.burst, at_ms: now };
    // A clock stepped back (NTP) refills nothing, and must not take tokens away.
    b.tokens = Math.min(this.o.burst, b.tokens + Math.max(0, now - b.at_ms) * rate_ms);
    b.at_ms = now;
    this.buckets.set(key, b); // re-inserted: the map's order is least recently used first
    if (this.buckets.size > this.o.max_keys) this.buckets.delete(this.buckets.keys().next().value!);
    if (b.tokens < 1) return Math.ceil((1 - b.tokens) / rate_ms / 1000);
    b.tokens -= 1;
    return 0;
  }
}
