import type {
  ApiRoutes,
  RouteBody,
  RouteName,
  RouteParams,
  RouteQuery,
  RouteResponse,
} from '@thermargin/shared/api-routes';
import type { Actor } from '@thermargin/store/workflow';
import type { Context } from 'hono';

/** What a handler gets: path parameters, query and body validated by its route's schemas, and who asks. */
export interface HandlerInput<K extends RouteName> {
  c: Context;
  params: RouteParams<K>;
  query: RouteQuery<K>;
  body: RouteBody<K>;
  actor: Actor;
}

declare const answerOf: unique symbol;
/** A Response whose body is a route's answer, written ahead (JsonPage): typed like a returned value. */
export type Answer<T> = Response & { readonly [answerOf]: T };

/** A route's handler: its answer as a value or an Answer, or any Response for a stream. */
export type Handler<K extends RouteName> = (
  input: HandlerInput<K>,
) => Promise<ApiRoutes[K]['response'] extends null ? Response : RouteResponse<K> | Answer<RouteResponse<K>>>;

/** Handlers for the routes named `K` (shared/src/api-routes.ts): the API needs one for every route. */
export type Handlers<K extends RouteName = RouteName> = { [N in K]: Handler<N> };
