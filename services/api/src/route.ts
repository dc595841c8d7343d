import type { ApiRole } from '@thermargin/shared';
import type { Actor } from '@thermargin/store/sqlite-workflow';
import type { Context } from 'hono';
import type { z } from 'zod';

/** What a handler gets: validated path parameters, query and body, and who asks. */
export interface RouteInput<Q, B> {
  c: Context;
  params: Record<string, string>;
  query: Q;
  body: B;
  actor: Actor;
}

/**
 * One route: the single description the app registers and the OpenAPI document is generated from.
 * `role` null: no token needed. `params` are validated with idSchema.
 */
export interface Route<Q = unknown, B = unknown> {
  method: 'get' | 'post' | 'put' | 'delete';
  /** Hono form, e.g. `/api/vehicles/:id`. */
  path: string;
  role: ApiRole | null;
  summary: string;
  query?: z.ZodType<Q>;
  body?: z.ZodType<B>;
  /** JSON schema of the answer; null for a stream (SSE). */
  response: z.ZodType | null;
  /** Largest body in bytes, when not the API's default. */
  max_body_bytes?: number;
  handle(input: RouteInput<Q, B>): Promise<unknown>;
}

/** Keeps each route's query and body types tied to its handler. */
export const route = <Q, B>(r: Route<Q, B>): Route => r as unknown as Route;
