import { RateLimiter } from '@thermargin/api/rate-limit';
import { describe, expect, it } from 'vitest';

describe('rate limit (token bucket per key)', () => {
  const limiter = (now: { ms: number }, max_keys = 10) =>
    new RateLimiter({ per_minute: 60, burst: 3, max_keys }, () => now.ms);

  it('lets a burst through, then says how long to wait; refills at the rate', () => {
    const now = { ms: 1_000_000 };
    const r = limiter(now);
    expect([r.take('a'), r.take('a'), r.take('a')]).toEqual([0, 0, 0]);
    expect(r.take('a')).toBe(1); // 60 a minute: one token a second
    expect(r.take('b')).toBe(0); // keys are separate
    now.ms += 2_000;
    expect([r.take('a'), r.take('a'), r.take('a')]).toEqual([0, 0, 1]);
  });

  it('a clock stepped back refills nothing and locks nobody out', () => {
    const now = { ms: 10_000_000 };
    const r = limiter(now);
    r.take('a');
    now.ms -= 3_600_000;
    expect([r.take('a'), r.take('a'), r.take('a')]).toEqual([0, 0, 1]);
    now.ms += 1_000;
    expect(r.take('a')).toBe(0);
  });

  it('keeps at most max_keys buckets: the least recently used is forgotten (a full bucket again)', () => {
    const now = { ms: 0 };
    const r = limiter(now, 2);
    for (let i = 0; i < 3; i++) r.take('a');
    expect(r.take('a')).toBe(1);
    r.take('b');
    r.take('c'); // 'a' was used before 'b': forgotten
    expect(r.take('a')).toBe(0);
  });
});
