import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { BrokerUser } from '@thermargin/broker';

/**
 * What makes a second `npm start` resume on the same data: the demo's seed, size and the end of its
 * history are fixed at the first start, and so are the generated secrets (broker passwords per vehicle,
 * the ingester's, the demo API token). Kept in the data folder, readable by the owner only.
 */
export interface DemoState {
  seed: number;
  vehicles: number;
  days: number;
  history_end_ms: number;
  ingester_password: string;
  vehicle_passwords: Record<string, string>;
  api_token: string;
}

const secret = () => randomBytes(18).toString('base64url');

export function loadDemoState(
  dir: string,
  fresh: Omit<DemoState, 'ingester_password' | 'vehicle_passwords' | 'api_token'>,
): DemoState {
  const path = join(dir, 'demo-state.json');
  if (existsSync(path)) return JSON.parse(readFileSync(path, 'utf8')) as DemoState;
  const state: DemoState = {
    ...fresh,
    ingester_password: secret(),
    vehicle_passwords: {},
    api_token: secret(),
  };
  writeFileSync(path, JSON.stringify(state, null, 1), { mode: 0o600 });
  return state;
}

/** Saves new vehicles' passwords (a fleet file that grew). */
export function vehiclePassword(dir: string, state: DemoState, vehicle: string): string {
  let p = state.vehicle_passwords[vehicle];
  if (!p) {
    p = secret();
    state.vehicle_passwords[vehicle] = p;
    writeFileSync(join(dir, 'demo-state.json'), JSON.stringify(state, null, 1), { mode: 0o600 });
  }
  return p;
}

export const INGESTER_USER = 'ingester';

/** The broker's users: the ingester (subscribe only) and each vehicle (its own topic only). */
export function brokerUsers(dir: string, state: DemoState, vehicles: readonly string[]): BrokerUser[] {
  return [
    { username: INGESTER_USER, password: state.ingester_password, role: 'ingester' },
    ...vehicles.map((v) => ({
      username: v,
      password: vehiclePassword(dir, state, v),
      role: 'vehicle' as const,
    })),
  ];
}
