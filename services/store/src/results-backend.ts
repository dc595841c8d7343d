import type { Logger } from '@thermargin/shared/log';
import type { AnalysisStore } from './analysis.ts';
import type { ResultsConfig } from './config.ts';
import { createPostgresAnalysisStore } from './postgres-analysis.ts';
import { PostgresDb } from './postgres-db.ts';
import { createPostgresWorkflowStore } from './postgres-workflow.ts';
import { createAnalysisStore, openResultsDb } from './sqlite-analysis-store.ts';
import { createWorkflowStore } from './sqlite-workflow.ts';
import type { WorkflowStore } from './workflow.ts';

/** One process role's connection to the results database (each role opens its own). */
export interface ResultsBackend {
  readonly kind: ResultsConfig['kind'];
  readonly analysis: AnalysisStore;
  readonly workflow: WorkflowStore;
  close(): Promise<void>;
}

/** Opens the results database a configuration names; PostgreSQL is migrated to this version's schema first. */
export async function openResults(config: ResultsConfig, log?: Logger): Promise<ResultsBackend> {
  if (config.kind === 'sqlite') {
    const db = openResultsDb(config.path);
    const analysis = createAnalysisStore(db);
    return { kind: 'sqlite', analysis, workflow: createWorkflowStore(db), close: () => analysis.close() };
  }
  const { kind: _, ...options } = config;
  const db = await PostgresDb.open(options, log);
  return {
    kind: 'postgres',
    analysis: createPostgresAnalysisStore(db),
    workflow: createPostgresWorkflowStore(db),
    close: () => db.close(),
  };
}
