import type { z } from 'zod';
import { type FleetInput, fleetSchema } from './fleet.ts';
import { type DataMap, dataMapSchema } from './mapping.ts';
import { InputError, zodProblems } from './validation.ts';

/** line:column of a character offset, 1-based. */
function lineCol(text: string, offset: number): string {
  const before = text.slice(0, offset);
  const line = before.split('\n').length;
  return `${line}:${offset - before.lastIndexOf('\n')}`;
}

/**
 * Parses a JSON file's text and validates it. Errors name the source and the line (JSON syntax) or the
 * field path (schema rules), e.g. `fleet.json: vehicles[1].radiator_area_m2: radiator_area_m2 must be > 0`.
 */
export function parseJsonText<S extends z.ZodType>(text: string, source: string, schema: S): z.infer<S> {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    const where = pos ? `${source}:${lineCol(text, Number(pos[1]))}` : source;
    throw new InputError([{ where, rule: `not valid JSON (${msg})` }], `${source} is not valid`);
  }
  const r = schema.safeParse(data);
  if (!r.success) throw new InputError(zodProblems(source, r.error), `${source} is not valid`);
  return r.data;
}

export function parseFleetText(text: string, source: string): FleetInput {
  return parseJsonText(text, source, fleetSchema);
}

/** A data mapping file's text (see mapping.ts), validated. */
export function parseDataMapText(text: string, source: string): DataMap {
  return parseJsonText(text, source, dataMapSchema);
}
