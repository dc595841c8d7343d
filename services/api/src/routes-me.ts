import { meResponseSchema, type MeResponse } from '@thermargin/shared';
import { type Route, route } from './route.ts';

/** Who the token is: the dashboard's sign-in asks this instead of probing routes for the role. */
export function meRoutes(): Route[] {
  return [
    route({
      method: 'get',
      path: '/api/me',
      role: 'viewer',
      summary: "The token's name and role (any valid token)",
      response: meResponseSchema,
      handle: async ({ actor }): Promise<MeResponse> => ({ name: actor.by, role: actor.role }),
    }),
  ];
}
