import { decimalNumber } from './validation.ts';

/**
 * Typed readers of environment variables for the services' configs. Each reader records a bad value
 * in `problems` instead of throwing, so a config can report every bad variable in one error.
 */
export type Env = Record<string, string | undefined>;

export interface EnvReader {
  /** The value; `fallback` when unset or empty; required (a problem) when there is no fallback. */
  str(name: string, fallback?: string): string;
  /** An integer ≥ min; `fallback` when unset or empty. */
  int(name: string, fallback: number, min: number): number;
  /** One of `allowed`; `fallback` when unset or empty. */
  oneOf<T extends string>(name: string, allowed: readonly T[], fallback: T): T;
}

export function envReader(env: Env, problems: string[]): EnvReader {
  const str = (name: string, fallback?: string): string => {
    const v = env[name];
    if (v !== undefined && v !== '') return v;
    if (fallback === undefined) problems.push(`${name} is required`);
    return fallback ?? '';
  };
  return {
    str,
    int: (name, fallback, min) => {
      const raw = env[name];
      if (raw === undefined || raw === '') return fallback;
      const v = decimalNumber(raw);
      if (!Number.isInteger(v) || v < min)
        problems.push(`${name} must be an integer ≥ ${min} (got ${JSON.stringify(raw)})`);
      return v;
    },
    oneOf: (name, allowed, fallback) => {
      const v = str(name, fallback) as (typeof allowed)[number];
      if (!allowed.includes(v))
        problems.push(`${name} must be one of ${allowed.join(', ')} (got ${JSON.stringify(v)})`);
      return v;
    },
  };
}
