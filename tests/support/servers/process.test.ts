import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freePort } from './free-port.ts';
import { listensOn } from './port-owner.ts';
import { PortClashError, retryOnPortClash, ServerProcess } from './process.ts';

describe('test servers own their port', () => {
  it('finds the listener of a port and its owner', async () => {
    const server = createServer();
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    const port = (server.address() as { port: number }).port;
    expect(listensOn(process.pid, port)).toBe(true);
    expect(listensOn(1, port)).toBe(false);
    server.close();
  });

  it('a server whose readiness probe is answered by someone else fails with a port clash, and the start is retried', async () => {
    // Another process's listener answers the probe; ours (sleep) never binds the port.
    const other = createServer();
    await new Promise<void>((r) => other.listen(0, '127.0.0.1', r));
    const port = (other.address() as { port: number }).port;
    let starts = 0;
    const start = async () => {
      starts++;
      const proc = new ServerProcess(
        'sleep',
        '/bin/sleep',
        ['30'],
        join(tmpdir(), 'thermargin-clash.log'),
        port,
        async () => {},
      );
      await proc.start();
      return proc;
    };
    await expect(retryOnPortClash(start, 2)).rejects.toBeInstanceOf(PortClashError);
    expect(starts).toBe(2);
    other.close();
  });

  it('hands out a port nothing listens on', async () => {
    expect(listensOn(process.pid, await freePort())).toBe(false);
  });
});
