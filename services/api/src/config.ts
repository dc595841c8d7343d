import { type AnalyzerConfig, readAnalyzerConfig } from '@thermargin/analyzer/config';
import { type Env, envReader } from '@thermargin/shared/env';
import { type DeploymentConfig, readDeploymentConfig } from '@thermargin/usecases/config';
import { RATE_LIMIT_DEFAULTS } from './rate-limit.ts';

/** The API's environment variables (plus the deployment's FLEET_FILE, STORE_*, RESULTS_* and the
 *  analyzer's ANALYZER_POLL_MS). */
export const API_ENV = {
  PORT: 'API_PORT',
  HOST: 'API_HOST',
  TOKENS: 'API_TOKENS',
  TOKENS_FILE: 'API_TOKENS_FILE',
  CORS_ORIGINS: 'API_CORS_ORIGINS',
  RATE_PER_MIN: 'API_RATE_LIMIT_PER_MIN',
  RATE_BURST: 'API_RATE_LIMIT_BURST',
  WEB_DIST: 'API_WEB_DIST',
  RUN_ANALYZER: 'API_RUN_ANALYZER',
} as const;

export interface ApiConfig {
  port: number;
  host: string;
  tokens: string;
  tokens_file: string | undefined;
  cors_origins: string[];
  rate_limit: { per_minute: number; burst: number };
  web_dist: string;
  run_analyzer: boolean;
  deployment: DeploymentConfig;
  analyzer: AnalyzerConfig;
}

export function readApiConfig(env: Env = process.env): ApiConfig {
  const problems: string[] = [];
  const { int } = envReader(env, problems);
  const run = env[API_ENV.RUN_ANALYZER] ?? '1';
  if (run !== '0' && run !== '1') problems.push(`${API_ENV.RUN_ANALYZER} must be 0 or 1`);
  const config = {
    port: int(API_ENV.PORT, 8080, 0),
    host: env[API_ENV.HOST] || '127.0.0.1',
    tokens: env[API_ENV.TOKENS] ?? '',
    tokens_file: env[API_ENV.TOKENS_FILE] || undefined,
    cors_origins: (env[API_ENV.CORS_ORIGINS] ?? '')
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean),
    rate_limit: {
      per_minute: int(API_ENV.RATE_PER_MIN, RATE_LIMIT_DEFAULTS.per_minute, 1),
      burst: int(API_ENV.RATE_BURST, RATE_LIMIT_DEFAULTS.burst, 1),
    },
    web_dist: env[API_ENV.WEB_DIST] || 'web/dist',
    run_analyzer: run === '1',
    deployment: readDeploymentConfig(env, problems),
    analyzer: readAnalyzerConfig(env, problems),
  };
  if (!config.tokens && !config.tokens_file)
    problems.push(`${API_ENV.TOKENS} or ${API_ENV.TOKENS_FILE} is required (no token, no access)`);
  if (problems.length) throw new Error(`api configuration:\n  ${problems.join('\n  ')}`);
  return config;
}
