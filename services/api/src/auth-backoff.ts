import type { Logger } from '@thermargin/shared/log';

/**
 * Back-off for failed authentication, per client address: after `free_failures` wrong tokens the
 * address must wait `first_wait_s`, doubled with each further failure up to `max_wait_s`; while it
 * waits every request from it is answered 429 before any token is looked at. A valid token from the
 * address clears its count (a mistyped token is forgiven); failures are forgotten after `forget_s`
 * without one.
 */
export const AUTH_BACKOFF_DEFAULTS = {
  free_failures: 5,
  first_wait_s: 1,
  max_wait_s: 300,
  forget_s: 900,
  /** addresses kept, 10 000: the least recently failed are forgotten beyond it (bounded memory). */
  max_keys: 10_000,
};

export type AuthBackoffOptions = typeof AUTH_BACKOFF_DEFAULTS;

interface Failures {
  count: number;
  last_ms: number;
  /** ms: the address may try again from this time on. */
  until_ms: number;
}

export class AuthBackoff {
  private readonly failures = new Map<string, Failures>();

  constructor(
    private readonly o: AuthBackoffOptions,
    private readonly clock: () => number,
    private readonly log: Logger = () => {},
  ) {}

  /** 0 when `address` may try a token now; else whole seconds to wait. */
  wait(address: string): number {
    const f = this.current(address);
    if (!f) return 0;
    const left = f.until_ms - this.clock();
    return left > 0 ? Math.ceil(left / 1000) : 0;
  }

  failed(address: string): void {
    const now = this.clock();
    const f = this.current(address) ?? { count: 0, last_ms: now, until_ms: 0 };
    this.failures.delete(address);
    f.count++;
    f.last_ms = now;
    const over = f.count - this.o.free_failures;
    if (over > 0) {
      const wait_s = Math.min(this.o.max_wait_s, this.o.first_wait_s * 2 ** (over - 1));
      f.until_ms = now + wait_s * 1000;
      this.log('auth_backoff', { address, failures: f.count, wait_s });
    }
    this.failures.set(address, f); // re-inserted: the map's order is least recently failed first
    if (this.failures.size > this.o.max_keys) this.failures.delete(this.failures.keys().next().value!);
  }

  succeeded(address: string): void {
    this.failures.delete(address);
  }

  private current(address: string): Failures | undefined {
    const f = this.failures.get(address);
    // A clock stepped back forgets nothing early and blocks nobody longer than the wait.
    if (f && this.clock() - f.last_ms > this.o.forget_s * 1000) {
      this.failures.delete(address);
      return undefined;
    }
    if (f && f.until_ms - this.clock() > this.o.max_wait_s * 1000)
      f.until_ms = this.clock() + this.o.max_wait_s * 1000;
    return f;
  }
}
