import type { Context } from 'hono';
import { HttpError } from './http-error.ts';

/** levels, 32: the deepest JSON body taken (a fleet file nests 5). */
export const MAX_JSON_DEPTH = 32;

/**
 * How deep `text` nests arrays and objects, counted without parsing (strings skipped), stopping once
 * past `max`: a body of 100 000 brackets parses, then overflows the stack of whatever walks it.
 */
export function jsonDepth(text: string, max: number): number {
  let depth = 0;
  let deepest = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 34) {
      // a string: to its closing quote, escapes skipped
      for (i++; i < text.length && text.charCodeAt(i) !== 34; i++) if (text.charCodeAt(i) === 92) i++;
    } else if (c === 91 || c === 123) {
      if (++depth > deepest && (deepest = depth) > max) return deepest;
    } else if (c === 93 || c === 125) depth--;
  }
  return deepest;
}

/** The request's JSON body, checked for type and depth before it is parsed (its size is checked as it is read). */
export async function readJson(c: Context): Promise<unknown> {
  const type = c.req.header('content-type') ?? '';
  if (!/^application\/json\b/i.test(type))
    throw new HttpError(415, 'unsupported_media_type', 'send the body as application/json');
  const text = await c.req.text();
  if (jsonDepth(text, MAX_JSON_DEPTH) > MAX_JSON_DEPTH)
    throw new HttpError(400, 'bad_request', `body nests deeper than ${MAX_JSON_DEPTH} levels`, [
      { where: 'body', rule: `must nest at most ${MAX_JSON_DEPTH} levels of arrays and objects` },
    ]);
  try {
    return JSON.parse(text);
  } catch (e) {
    throw new HttpError(400, 'bad_request', `body is not valid JSON (${(e as Error).message})`, [
      { where: 'body', rule: 'must be valid JSON' },
    ]);
  }
}
