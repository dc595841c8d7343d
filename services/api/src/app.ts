import { API_ROLES, type ApiRole, idSchema } from '@thermargin/shared';
import {
  API_ROUTES,
  type RouteBody,
  type RouteName,
  type RouteParams,
  type RouteQuery,
  type RouteSpec,
} from '@thermargin/shared/api-routes';
import { isStorageError, storeFault } from '@thermargin/store';
import type { Actor } from '@thermargin/store/workflow';
import { getConnInfo } from '@hono/node-server/conninfo';
import { type Context, Hono, type MiddlewareHandler } from 'hono';
import { bodyLimit } from 'hono/body-limit';
import { cors } from 'hono/cors';
import { secureHeaders } from 'hono/secure-headers';
import { z } from 'zod';
import { ApiContext } from './context.ts';
import { AUTH_BACKOFF_DEFAULTS, AuthBackoff } from './auth-backoff.ts';
import { API_DEFAULTS, type ApiDeps } from './deps.ts';
import { outageAs503 } from './store-outage.ts';
import { EventHub, eventRoutes } from './events.ts';
import { errorBody, HttpError, parseInput } from './http-error.ts';
import { readJson } from './json-body.ts';
import { openApiDocument } from './openapi.ts';
import { RATE_LIMIT_DEFAULTS, RateLimiter } from './rate-limit.ts';
import { meRoutes } from './routes-me.ts';
import { intakeRoutes } from './routes-intake.ts';
import { readRoutes } from './routes-read.ts';
import { sizingRoutes } from './routes-sizing.ts';
import { traceRoutes } from './routes-trace.ts';
import { writeRoutes } from './routes-write.ts';
import type { Handler, Handlers } from './route.ts';
import { serveDashboard } from './static.ts';

const rank = (r: ApiRole) => API_ROLES.indexOf(r);
const ANONYMOUS: Actor = { by: 'anonymous', role: 'viewer' };

function clientIp(c: Context): string {
  try {
    return getConnInfo(c).remote.address ?? 'unknown';
  } catch {
    return 'unknown';
  }
}

/** 429 with Retry-After when `wait_s` > 0. */
function tooMany(c: Context, wait_s: number, what: string): void {
  if (wait_s <= 0) return;
  c.header('retry-after', String(wait_s));
  throw new HttpError(429, 'too_many_requests', `${what}: retry in ${wait_s} s`);
}

const NO_QUERY = z.strictObject({});
const PATH_PARAMS = z.record(z.string(), idSchema);

/**
 * Registers one route of the table with its handler: the role check, then path, query and body parsed
 * by the route's own schemas, so the handler gets exactly the types its entry declares.
 */
function register<K extends RouteName>(app: Hono, name: K, handle: Handler<K>, default_body_bytes: number) {
  const r: RouteSpec = API_ROUTES[name];
  const limit = r.max_body_bytes ?? default_body_bytes;
  const handlers: MiddlewareHandler[] = [];
  if (r.body)
    handlers.push(
      bodyLimit({
        maxSize: limit,
        onError: () => {
          throw new HttpError(413, 'too_large', `body over ${limit} bytes`);
        },
      }),
    );
  app.on([r.method.toUpperCase()], [r.path, ...(r.old_paths ?? [])], ...handlers, async (c: Context) => {
    const actor = c.get('actor' as never) as Actor | undefined;
    if (r.role !== null) {
      if (!actor) throw new HttpError(401, 'unauthorized', 'a bearer token is required');
      if (rank(actor.role) < rank(r.role))
        throw new HttpError(403, 'forbidden', `needs role ${r.role} (token ${actor.by} has ${actor.role})`);
    }
    // Parsed by this route's schemas: the types below are what they accept.
    const params = parseInput(PATH_PARAMS, c.req.param(), 'path') as RouteParams<K>;
    const query = parseInput(r.query ?? NO_QUERY, c.req.query(), 'query') as RouteQuery<K>;
    const body = (r.body ? parseInput(r.body, await readJson(c), 'body') : undefined) as RouteBody<K>;
    const out = await handle({ c, params, query, body, actor: actor ?? ANONYMOUS });
    return out instanceof Response ? out : c.json(out as object);
  });
}

/** The API as a Hono app: every route of the route table, the OpenAPI document, and the dashboard. */
export function createApi(deps: ApiDeps): Hono {
  const x = new ApiContext({ ...deps, samples: outageAs503(deps.samples) });
  const hub = new EventHub(x, deps.events_poll_ms ?? API_DEFAULTS.events_poll_ms);
  const handlers: Handlers = {
    ...readRoutes(x),
    ...traceRoutes(x),
    ...writeRoutes(x),
    ...eventRoutes(hub, deps.tokens, deps.changes),
    ...sizingRoutes(x),
    ...meRoutes(),
    ...intakeRoutes(x),
  };
  const rates = { ...RATE_LIMIT_DEFAULTS, ...deps.rate_limit };
  const limiter = new RateLimiter(rates, x.clock);
  const addressLimiter = new RateLimiter(
    {
      ...rates,
      per_minute: rates.per_minute * rates.address_factor,
      burst: rates.burst * rates.address_factor,
    },
    x.clock,
  );
  const backoff = new AuthBackoff({ ...AUTH_BACKOFF_DEFAULTS, ...deps.auth_backoff }, x.clock, deps.log);
  const app = new Hono();

  app.onError((e, c) => {
    if (e instanceof HttpError) {
      if (e.status === 401) c.header('www-authenticate', 'Bearer');
      // The rest of an oversized body is never read: the connection cannot be reused.
      if (e.status === 413) c.header('connection', 'close');
      if (e.status === 503) deps.log?.('api_store_unavailable', { path: c.req.path, error: e.message });
      return c.json(errorBody(e), e.status);
    }
    // The results store failing: disk full, read-only, locked, not answering — said as it is.
    if (isStorageError(e)) {
      const f = storeFault(e);
      deps.log?.('api_store_unavailable', { path: c.req.path, kind: f.kind, error: f.reason });
      return c.json(
        errorBody(
          new HttpError(503, 'store_unavailable', `results store (${deps.results.kind}): ${f.reason}`),
        ),
        503,
      );
    }
    deps.log?.('api_error', { path: c.req.path, error: (e as Error).stack ?? String(e) });
    return c.json(errorBody(new HttpError(500, 'internal', 'internal error')), 500);
  });
  app.notFound((c) =>
    c.json(errorBody(new HttpError(404, 'not_found', `no route ${c.req.method} ${c.req.path}`)), 404),
  );
  app.use(
    '*',
    secureHeaders({
      contentSecurityPolicy: {
        defaultSrc: ["'self'"],
        imgSrc: ["'self'", 'data:'],
        styleSrc: ["'self'", "'unsafe-inline'"],
        frameAncestors: ["'none'"],
      },
    }),
  );
  if (deps.cors_origins?.length)
    app.use(
      '/api/*',
      cors({ origin: [...deps.cors_origins], allowHeaders: ['authorization', 'content-type'], maxAge: 600 }),
    );

  // Before any token is looked at: an address in back-off after failed sign-ins, or over its own
  // limit, is turned away. Then who asks (a bad token is refused even on public routes), then the rate
  // limit per token or address.
  app.use('/api/*', async (c, next) => {
    const address = clientIp(c);
    tooMany(c, backoff.wait(address), 'too many failed sign-ins from this address');
    tooMany(c, addressLimiter.take(`addr:${address}`), 'rate limit of this address reached');
    const auth = c.req.header('authorization');
    let actor: Actor | undefined;
    if (auth !== undefined) {
      const m = /^Bearer\s+(\S+)$/i.exec(auth);
      const t = m ? await deps.tokens.verify(m[1]!) : undefined;
      if (!t) {
        backoff.failed(address);
        throw new HttpError(401, 'unauthorized', 'the bearer token is not valid');
      }
      backoff.succeeded(address);
      actor = { by: t.name, role: t.role };
      c.set('token' as never, t as never);
    }
    tooMany(c, limiter.take(actor ? `token:${actor.by}` : `ip:${address}`), 'rate limit reached');
    c.set('actor' as never, actor as never);
    await next();
  });

  const doc = openApiDocument(API_ROUTES);
  app.get('/api/openapi.json', (c) => c.json(doc));

  const bodyBytes = deps.max_body_bytes ?? API_DEFAULTS.max_body_bytes;
  for (const name of Object.keys(API_ROUTES) as RouteName[]) register(app, name, handlers[name], bodyBytes);
  app.all('/api/*', (c) =>
    c.json(errorBody(new HttpError(404, 'not_found', `no route ${c.req.method} ${c.req.path}`)), 404),
  );
  if (deps.web_dist) serveDashboard(app, deps.web_dist);
  return app;
}
