import type { ApiRole } from '@thermargin/shared/api';
import { ApiClient, ApiFailure } from '../api/client.ts';

const KEY = 'thermargin.token';

export interface Session {
  token: string;
  role: ApiRole;
  api: ApiClient;
}

export const savedToken = (): string | null => sessionStorage.getItem(KEY);
export const forgetToken = (): void => sessionStorage.removeItem(KEY);

/** Answers 2xx or 400 (its body was refused after the role check passed), not 401/403. */
async function allowed(p: Promise<unknown>): Promise<boolean> {
  try {
    await p;
    return true;
  } catch (e) {
    if (e instanceof ApiFailure && e.status === 400) return true;
    if (e instanceof ApiFailure && e.status === 403) return false;
    throw e;
  }
}

/**
 * Checks a token and finds its role without side effects: /api/status needs a viewer; an alert action
 * with an empty body is refused with 403 below engineer and with 400 (nothing written) from engineer up;
 * /api/tokens answers admins only. Keeps the token in sessionStorage when it is valid.
 */
export async function signIn(token: string): Promise<Session> {
  const api = new ApiClient(token);
  await api.status();
  let role: ApiRole = 'viewer';
  if (await allowed(api.request('POST', '/api/vehicles/role-probe/alerts/role-probe/acknowledge', {}))) {
    role = 'engineer';
    if (await allowed(api.request('GET', '/api/tokens'))) role = 'admin';
  }
  sessionStorage.setItem(KEY, token);
  return { token, role, api };
}

export const canWrite = (s: Session): boolean => s.role !== 'viewer';
