import type { Logger } from '@thermargin/shared/log';
import type { AnalyzerStats } from '@thermargin/analyzer/analyzer';
import type { LoadedFleet } from '@thermargin/usecases/fleet-file';
import type { SampleStore } from '@thermargin/store';
import type { AnalysisStore } from '@thermargin/store/analysis';
import type { ResultChanges } from '@thermargin/store/changes';
import type { WorkflowStore } from '@thermargin/store/workflow';
import type { AuthBackoffOptions } from './auth-backoff.ts';
import type { RateLimitOptions } from './rate-limit.ts';
import type { TokenRegistry } from './tokens.ts';

/** The fleet file the API serves and may reload or replace. */
export interface FleetSource {
  current(): LoadedFleet;
  /** Re-reads the file; throws an InputError (nothing changes) when it is not valid. */
  reload(): LoadedFleet;
  /** Validates `text`, writes it as the fleet file and loads it. */
  replace(text: string): LoadedFleet;
}

export interface ApiDeps {
  samples: SampleStore;
  results: AnalysisStore;
  workflow: WorkflowStore;
  /** Numbered result commits and their notifications (PostgreSQL): live trip events, resumable. */
  changes?: ResultChanges;
  fleet: FleetSource;
  tokens: TokenRegistry;
  /** An analyzer in the same process: its stats go to /api/status, fleet changes re-analyse through it. */
  analyzer?: { stats: AnalyzerStats; reanalyze(scope: { vehicle?: string }): Promise<void> };
  clock?: () => number;
  log?: Logger;
  /** The built dashboard (web/dist); served with SPA fallback when the folder exists. */
  web_dist?: string;
  /** Origins allowed by CORS; none (the default) means no CORS headers at all. */
  cors_origins?: readonly string[];
  rate_limit?: Partial<RateLimitOptions>;
  auth_backoff?: Partial<AuthBackoffOptions>;
  /** bytes, 65 536: largest request body (the fleet file PUT: 1 MiB). */
  max_body_bytes?: number;
  /** ms, 1000: how often live events look for new results and samples. */
  events_poll_ms?: number;
}

export const API_DEFAULTS = {
  max_body_bytes: 64 * 1024,
  events_poll_ms: 1000,
  /** ms, 2000: how long the newest-sample and span reads are reused (each scans the sample index). */
  sample_cache_ms: 2000,
};
