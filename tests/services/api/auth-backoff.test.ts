import { AuthBackoff } from '@thermargin/api/auth-backoff';
import { describe, expect, it } from 'vitest';

describe('back-off after failed sign-ins (per address)', () => {
  const o = { free_failures: 2, first_wait_s: 1, max_wait_s: 8, forget_s: 60, max_keys: 2 };
  const make = (now: { ms: number }) => new AuthBackoff(o, () => now.ms);

  it('lets the free failures through, then doubles the wait up to the most, per address', () => {
    const now = { ms: 1_000_000 };
    const b = make(now);
    const waits: number[] = [];
    for (let i = 0; i < 7; i++) {
      b.failed('a');
      waits.push(b.wait('a'));
      now.ms += b.wait('a') * 1000;
    }
    expect(waits).toEqual([0, 0, 1, 2, 4, 8, 8]);
    expect(b.wait('b')).toBe(0);
  });

  it('a success clears it; failures are forgotten after a quiet spell; a clock stepped back waits no longer', () => {
    const now = { ms: 1_000_000 };
    const b = make(now);
    for (let i = 0; i < 3; i++) b.failed('a');
    expect(b.wait('a')).toBe(1);
    b.succeeded('a');
    expect(b.wait('a')).toBe(0);
    for (let i = 0; i < 3; i++) b.failed('a');
    now.ms += 61_000;
    b.failed('a');
    expect(b.wait('a')).toBe(0); // one failure since the count was forgotten
    for (let i = 0; i < 4; i++) b.failed('a');
    now.ms -= 3_600_000;
    expect(b.wait('a')).toBeLessThanOrEqual(8);
  });

  it('keeps at most max_keys addresses (the least recently failed go first)', () => {
    const now = { ms: 0 };
    const b = make(now);
    for (const a of ['a', 'b', 'c']) for (let i = 0; i < 3; i++) b.failed(a);
    expect([b.wait('a'), b.wait('b'), b.wait('c')]).toEqual([0, 1, 1]);
  });
});
