import { type ChildProcess, spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FleetResponse, StatusResponse } from '@thermargin/shared';
import { expect } from 'vitest';
import { freePort, waitFor } from '../../support/servers/free-port.ts';

const START = join(import.meta.dirname, '../../../services/stack/src/start.ts');

/** `npm start`'s script as a child process on a temp data folder and free ports. */
export interface RunningStack {
  url: string;
  data: string;
  token: string;
  child: ChildProcess;
  log(): string;
  get<T>(path: string): Promise<T>;
  /** SIGINT, as Ctrl-C; resolves with the exit code. */
  stop(): Promise<number | null>;
}

export async function runStack(
  env: Record<string, string>,
  data = mkdtempSync(join(tmpdir(), 'thermargin-stack-')),
): Promise<RunningStack> {
  const port = await freePort();
  let out = '';
  const child = spawn(process.execPath, ['--import', 'tsx', START], {
    env: {
      ...process.env,
      THERMARGIN_DATA_DIR: data,
      THERMARGIN_BROKER_PORT: '0',
      API_PORT: String(port),
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (d) => (out += d));
  child.stderr!.on('data', (d) => (out += d));
  const url = `http://127.0.0.1:${port}`;
  await waitFor('the stack announcing its dashboard', async () => out.includes('API token:'), 600_000);
  const token = (JSON.parse(readFileSync(join(data, 'demo-state.json'), 'utf8')) as { api_token: string })
    .api_token;
  const get = async <T>(path: string): Promise<T> => {
    const r = await fetch(`${url}${path}`, { headers: { authorization: `Bearer ${token}` } });
    if (!r.ok) throw new Error(`${path}: HTTP ${r.status}`);
    return (await r.json()) as T;
  };
  return {
    url,
    data,
    token,
    child,
    log: () => out,
    get,
    stop: () =>
      new Promise((resolve) => {
        child.once('exit', (code) => resolve(code));
        child.kill('SIGINT');
      }),
  };
}

/** Waits until the analyzer has caught up with everything stored. */
export async function analysed(stack: RunningStack): Promise<FleetResponse> {
  // Two passes completed after the history was in (the stack announces only then) have analysed every
  // closed trip. A vehicle driving at the cut keeps its open trip past its watermark until it parks
  // (status counts it on a trip, not in the backlog): hours of wall time at some times of day.
  let first: number | undefined;
  await waitFor(
    'the analyzer catching up',
    async () => {
      await new Promise((r) => setTimeout(r, 250)); // under the API's rate limit (10 requests/s a token)
      const s = await stack.get<StatusResponse>('/api/status');
      first ??= s.analyzer.runs;
      return s.analyzer.runs >= first + 2 && !s.analyzer.running && s.analyzer.trips_analysed > 0;
    },
    600_000,
  );
  return stack.get<FleetResponse>('/api/fleet');
}

/** Pre-writes the demo's state so an external broker can be given the same users. */
export function presetState(data: string, state: object): void {
  writeFileSync(join(data, 'demo-state.json'), JSON.stringify(state), { mode: 0o600 });
}

/** A demo small enough for CI that still holds every fault case (the roster keeps them down to 6 vehicles). */
export const SMOKE_DEMO = { THERMARGIN_DEMO_VEHICLES: '6', THERMARGIN_DEMO_DAYS: '12' };

export function expectDemoFindings(fleet: FleetResponse): void {
  const by = new Map(fleet.vehicles.map((v) => [v.id, v]));
  const line = (id: string) => JSON.stringify(by.get(id));
  expect(by.size, 'every demo vehicle has a summary').toBe(6);
  expect(by.get('bus-02')?.cause, `the fouling bus: ${line('bus-02')}`).toBe('fouling');
  expect(['watch', 'inspect'], line('bus-02')).toContain(by.get('bus-02')?.status);
  expect(by.get('bus-03')?.cause, `the bus whose fan failed: ${line('bus-03')}`).toBe('fan');
  expect(['watch', 'inspect'], line('bus-03')).toContain(by.get('bus-03')?.status);
  expect(by.get('bus-01')?.status, `the healthy bus: ${line('bus-01')}`).toBe('ok');
}
