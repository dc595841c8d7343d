import { type ChildProcess, spawn } from 'node:child_process';
import { createWriteStream } from 'node:fs';
import { waitFor } from './free-port.ts';
import { listensOn } from './port-owner.ts';

/** The server's port was bound by another process first; a start on fresh ports may succeed. */
export class PortClashError extends Error {}

/** Runs `start` again (up to `attempts` times in all) while it fails with a PortClashError. */
export async function retryOnPortClash<T>(start: () => Promise<T>, attempts = 3): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await start();
    } catch (e) {
      if (!(e instanceof PortClashError) || i >= attempts) throw e;
    }
  }
}

/**
 * A server binary run as a child process listening on 127.0.0.1:`port`, its output kept in
 * `log_path` for post-mortems. Ready once `ready` resolves and the listener is the child's own.
 */
export class ServerProcess {
  private child: ChildProcess | undefined;

  constructor(
    readonly name: string,
    private readonly command: string,
    private readonly args: string[],
    private readonly log_path: string,
    private readonly port: number,
    private readonly ready: () => Promise<void>,
    /** Run as this user and group (a server that refuses to run as root, e.g. PostgreSQL). */
    private readonly user?: { uid: number; gid: number },
  ) {}

  get running(): boolean {
    return this.child !== undefined;
  }

  /** The running server's process id (benchmarks read its CPU time). */
  get pid(): number | undefined {
    return this.child?.pid;
  }

  async start(): Promise<void> {
    if (this.child) return;
    const log = createWriteStream(this.log_path, { flags: 'a' });
    const child = spawn(this.command, this.args, { stdio: ['ignore', 'pipe', 'pipe'], ...this.user });
    child.stdout?.pipe(log);
    child.stderr?.pipe(log);
    this.child = child;
    // A test runner that dies must not leave servers behind.
    const orphanGuard = () => child.kill('SIGKILL');
    process.once('exit', orphanGuard);
    child.once('exit', () => {
      process.off('exit', orphanGuard);
      if (this.child === child) this.child = undefined;
    });
    await this.ready();
    const pid = child.pid ?? -1;
    try {
      await waitFor(`${this.name} listening on ${this.port}`, async () => listensOn(pid, this.port), 2_000);
    } catch {
      await this.stop('SIGKILL');
      throw new PortClashError(
        `${this.name}: port ${this.port} is held by another process (log: ${this.log_path})`,
      );
    }
  }

  /** SIGTERM (a clean shutdown: Mosquitto saves its sessions), SIGKILL after 10 s. */
  async stop(signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
    const child = this.child;
    if (!child) return;
    const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
    child.kill(signal);
    const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
    await exited;
    clearTimeout(timer);
    this.child = undefined;
  }
}
