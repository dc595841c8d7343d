import { type ChildProcess, spawn } from 'node:child_process';
import { createWriteStream } from 'node:fs';

/** A server binary run as a child process, its output kept in `log_path` for post-mortems. */
export class ServerProcess {
  private child: ChildProcess | undefined;

  constructor(
    readonly name: string,
    private readonly command: string,
    private readonly args: string[],
    private readonly log_path: string,
    private readonly ready: () => Promise<void>,
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
    const child = spawn(this.command, this.args, { stdio: ['ignore', 'pipe', 'pipe'] });
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
