import { type ChildProcess, spawn } from 'node:child_process';
import { join } from 'node:path';

export const ROOT = join(import.meta.dirname, '../..');

/** A service's entry point (`node --import tsx services/…/main.ts`) as a child process, its log kept. */
export class ServiceProcess {
  private child: ChildProcess | undefined;
  private out = '';
  private exited: Promise<number | null> = Promise.resolve(null);

  constructor(
    readonly name: string,
    private readonly entry: string,
    private readonly env: Record<string, string>,
  ) {}

  start(): this {
    const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, this.entry)], {
      cwd: ROOT,
      env: { ...process.env, ...this.env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    child.stdout!.on('data', (d) => (this.out += d));
    child.stderr!.on('data', (d) => (this.out += d));
    this.exited = new Promise((r) => child.once('exit', (code) => r(code)));
    // A test runner that dies must not leave services behind.
    const guard = () => child.kill('SIGKILL');
    process.once('exit', guard);
    child.once('exit', () => process.off('exit', guard));
    this.child = child;
    return this;
  }

  get pid(): number | undefined {
    return this.child?.pid;
  }

  get running(): boolean {
    return this.child !== undefined && this.child.exitCode === null && this.child.signalCode === null;
  }

  log(): string {
    return this.out;
  }

  /** Sends `signal` and resolves with the exit code once the process is gone. */
  async stop(signal: NodeJS.Signals = 'SIGTERM'): Promise<number | null> {
    if (this.running) this.child!.kill(signal);
    return this.exited;
  }
}
