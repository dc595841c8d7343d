import type { ApiRole } from '@thermargin/shared/api';
import { ApiClient } from '../api/client.ts';

const KEY = 'thermargin.token';

export interface Session {
  token: string;
  role: ApiRole;
  /** The token's name, as the API's audit log records it. */
  name: string;
  api: ApiClient;
}

export const savedToken = (): string | null => sessionStorage.getItem(KEY);
export const forgetToken = (): void => sessionStorage.removeItem(KEY);

/** Checks a token and learns its name and role from /api/me; keeps the token in sessionStorage when valid. */
export async function signIn(token: string): Promise<Session> {
  const api = new ApiClient(token);
  const me = await api.call('me');
  sessionStorage.setItem(KEY, token);
  return { token, role: me.role, name: me.name, api };
}

export const canWrite = (s: Session): boolean => s.role !== 'viewer';
