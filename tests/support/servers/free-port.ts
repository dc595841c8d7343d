import { createServer } from 'node:net';

/** A TCP port free on 127.0.0.1 right now (the OS picks it; the caller binds it soon after). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      server.close(() =>
        typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port')),
      );
    });
  });
}

/** Polls `probe` until it resolves true, or throws after `timeout_ms` naming `what`. */
export async function waitFor(
  what: string,
  probe: () => Promise<boolean>,
  timeout_ms = 20_000,
): Promise<void> {
  const deadline = Date.now() + timeout_ms;
  for (;;) {
    if (await probe().catch(() => false)) return;
    if (Date.now() > deadline) throw new Error(`waitFor: ${what} not ready after ${timeout_ms} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
