import { type Problem, zodProblems } from '@thermargin/shared';
import type { z } from 'zod';

/** An error answered as `{ error: { code, message, problems? } }` with its HTTP status. */
export class HttpError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 429 | 500 | 503,
    readonly code: string,
    message: string,
    readonly problems?: Problem[],
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new HttpError(404, 'not_found', `${what} not found`);

/** Validates `data` (a body, query or path parameters) or throws a 400 naming each field and rule. */
export function parseInput<S extends z.ZodType>(schema: S, data: unknown, source: string): z.infer<S> {
  const r = schema.safeParse(data);
  if (r.success) return r.data;
  throw new HttpError(400, 'bad_request', `${source} is not valid`, zodProblems(source, r.error));
}

export function errorBody(e: HttpError) {
  return { error: { code: e.code, message: e.message, ...(e.problems ? { problems: e.problems } : {}) } };
}
