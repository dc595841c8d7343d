import type { ApiError } from '@thermargin/shared/api';
import {
  API_ROUTES,
  type RouteName,
  type RouteRequest,
  type RouteResponse,
} from '@thermargin/shared/api-routes';

/** A refused or failed request, with the API's own words. */
export class ApiFailure extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    /** Each field and the rule it broke (a 400). */
    readonly problems: { where: string; rule: string }[] = [],
  ) {
    super(message);
  }
}

/** A route's request as arguments: none when it takes no parameters, query or body. */
type RequestArgs<K extends RouteName> = unknown extends RouteRequest<K> ? [] : [request: RouteRequest<K>];

/** `path` with each `:param` filled in (encoded) and the query's defined values appended. */
export function routeUrl(path: string, params: Record<string, string> = {}, query: object = {}): string {
  const filled = path.replace(/:([A-Za-z_]+)/g, (_, name: string) => encodeURIComponent(params[name] ?? ''));
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined) q.set(k, String(v));
  const text = q.toString();
  return text ? `${filled}?${text}` : filled;
}

/**
 * The API over fetch with a bearer token. `call(name, request)` takes the route's method and path from
 * the shared route table and is typed by it: the parameters, query and body it needs, the answer it gives.
 */
export class ApiClient {
  constructor(private readonly token: string) {}

  call<K extends RouteName>(name: K, ...args: RequestArgs<K>): Promise<RouteResponse<K>> {
    const route = API_ROUTES[name];
    const r = (args[0] ?? {}) as { params?: Record<string, string>; query?: object; body?: unknown };
    return this.request(route.method.toUpperCase(), routeUrl(route.path, r.params, r.query), r.body);
  }

  private async request<T>(method: string, path: string, body?: unknown): Promise<T> {
    let res: Response;
    try {
      res = await fetch(path, {
        method,
        headers: {
          authorization: `Bearer ${this.token}`,
          ...(body === undefined ? {} : { 'content-type': 'application/json' }),
        },
        ...(body === undefined ? {} : { body: JSON.stringify(body) }),
      });
    } catch (e) {
      throw new ApiFailure(0, 'network', `the API cannot be reached (${(e as Error).message})`);
    }
    const text = await res.text();
    let json: unknown;
    try {
      json = text ? JSON.parse(text) : null;
    } catch {
      throw new ApiFailure(res.status, 'bad_response', `${method} ${path}: the answer is not JSON`);
    }
    if (!res.ok) {
      const err = (json as ApiError | null)?.error;
      throw new ApiFailure(
        res.status,
        err?.code ?? 'http',
        err?.message ?? `${method} ${path}: ${res.status}`,
        err?.problems,
      );
    }
    return json as T;
  }
}
