import { type Env, envReader } from '@thermargin/shared/env';
import { ANALYZER_DEFAULTS } from './options.ts';

/** The analyzer daemon's own variable; what it works on is the deployment's (services/usecases). */
export const ANALYZER_ENV = { POLL_MS: 'ANALYZER_POLL_MS' } as const;

export interface AnalyzerConfig {
  poll_ms: number;
}

/** The analyzer's configuration; a bad variable is added to `problems`. */
export function readAnalyzerConfig(env: Env, problems: string[]): AnalyzerConfig {
  return { poll_ms: envReader(env, problems).int(ANALYZER_ENV.POLL_MS, ANALYZER_DEFAULTS.poll_ms, 100) };
}
