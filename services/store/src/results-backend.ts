import type { AnalysisStore } from './analysis.ts';
import { createPostgresAnalysisStore } from './postgres-analysis.ts';
import { PostgresDb, type PostgresOptions } from './postgres-db.ts';
import { createPostgresWorkflowStore } from './postgres-workflow.ts';
import { createAnalysisStore, openResultsDb } from './sqlite-analysis-store.ts';
import { createWorkflowStore } from './sqlite-workflow.ts';
import type { WorkflowStore } from './workflow.ts';

/** Where results, analysis state and workflow records live: what RESULTS_* resolves to. */
export type ResultsConfig = { kind: 'sqlite'; path: string } | ({ kind: 'postgres' } & PostgresOptions);

/** One process role's connection to the results database (each role opens its own). */
export interface ResultsBackend {
  readonly kind: ResultsConfig['kind'];
  readonly analysis: AnalysisStore;
  readonly workflow: WorkflowStore;
  close(): Promise<void>;
}

export type StoreLog = (event: string, detail: Record<string, unknown>) => void;

/** Opens the results database a configuration names; PostgreSQL is migrated to this version's schema first. */
export async function openResults(config: ResultsConfig, log?: StoreLog): Promise<ResultsBackend> {
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
