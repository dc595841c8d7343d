import { z } from 'zod';

/** One broken rule: where (a file, line and/or field path) and which rule. */
export interface Problem {
  where: string;
  rule: string;
}

/** Input that cannot be used; `problems` says what and where, one line each. */
export class InputError extends Error {
  constructor(
    readonly problems: Problem[],
    headline = 'invalid input',
  ) {
    super(`${headline}:\n${problems.map((p) => `  ${p.where}: ${p.rule}`).join('\n')}`);
    this.name = 'InputError';
  }
}

/** A plain decimal number: sign, digits, point, exponent (`-12.5`, `.5`, `1e-3`); nothing else. */
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * The number written in decimal in `text` (spaces around allowed), else NaN: hexadecimal, octal and
 * binary literals (`0x10`), `Infinity` and digit separators are refused, which Number() would take.
 */
export function decimalNumber(text: string): number {
  const t = text.trim();
  return DECIMAL.test(t) ? Number(t) : Number.NaN;
}

/** `vehicles[2].design.heat_kw` from a zod issue path. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) out += typeof p === 'number' ? `[${p}]` : `${out ? '.' : ''}${String(p)}`;
  return out || '(root)';
}

/** zod's own words for a missing field ("expected number, received undefined") become "required". */
const MISSING = /^Invalid input: expected \w+, received undefined$/;

export function zodProblems(source: string, error: z.ZodError): Problem[] {
  return error.issues.map((i) => ({
    where: `${source}: ${formatPath(i.path)}`,
    rule: i.code === 'invalid_type' && MISSING.test(i.message) ? 'required' : i.message,
  }));
}

/** A number field whose errors name it: "heat_kw is required" when absent, "must be a number" when not one. */
export const numberField = (what: string) =>
  z.number({ error: (i) => (i.input === undefined ? `${what} is required` : `${what} must be a number`) });

/** Validates `data` against `schema`, or throws an InputError naming `source` and each field. */
export function parseOrThrow<S extends z.ZodType>(schema: S, data: unknown, source: string): z.infer<S> {
  const r = schema.safeParse(data);
  if (r.success) return r.data;
  throw new InputError(zodProblems(source, r.error), `${source} is not valid`);
}
