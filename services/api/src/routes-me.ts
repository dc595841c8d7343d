import type { Handlers } from './route.ts';

/** Who the token is: the dashboard's sign-in asks this instead of probing routes for the role. */
export function meRoutes(): Handlers<'me'> {
  return { me: async ({ actor }) => ({ name: actor.by, role: actor.role }) };
}
