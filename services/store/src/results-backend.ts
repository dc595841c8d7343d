import type { Logger } from '@thermargin/shared/log';
import type { AnalysisStore } from './analysis.ts';
import type { ResultChanges } from './changes.ts';
import type { ResultsConfig } from './config.ts';
import type { VehicleLeases } from './leases.ts';
import { createPostgresAnalysisStore } from './postgres-analysis.ts';
import { createPostgresChanges } from './postgres-changes.ts';
import { PostgresDb } from './postgres-db.ts';
import { createPostgresLeases, LEASE_DEFAULTS, replicaName } from './postgres-leases.ts';
import { createPostgresWorkflowStore } from './postgres-workflow.ts';
import { createAnalysisStore, openResultsDb } from './sqlite-analysis-store.ts';
import { createWorkflowStore } from './sqlite-workflow.ts';
import type { WorkflowStore } from './workflow.ts';

/** One process role's connection to the results database (each role opens its own). */
export interface ResultsBackend {
  readonly kind: ResultsConfig['kind'];
  readonly analysis: AnalysisStore;
  readonly workflow: WorkflowStore;
  /** Leases for analyzer replicas (PostgreSQL); undefined where one analyzer is the only writer (SQLite). */
  readonly leases: VehicleLeases | undefined;
  /** Numbered commits and their notifications (PostgreSQL); undefined on SQLite, read by polling. */
  readonly changes: ResultChanges | undefined;
  close(): Promise<void>;
}

export interface OpenResultsOptions {
  log?: Logger;
  /** This process's name in the lease table (default: host, pid and a random part). */
  holder?: string;
  /** ms: lease lifetime (LEASE_DEFAULTS.ttl_ms). */
  lease_ttl_ms?: number;
}

/** Opens the results database a configuration names; PostgreSQL is migrated to this version's schema first. */
export async function openResults(
  config: ResultsConfig,
  o: OpenResultsOptions = {},
): Promise<ResultsBackend> {
  if (config.kind === 'sqlite') {
    const db = openResultsDb(config.path);
    const analysis = createAnalysisStore(db);
    return {
      kind: 'sqlite',
      analysis,
      workflow: createWorkflowStore(db),
      leases: undefined,
      changes: undefined,
      close: () => analysis.close(),
    };
  }
  const { kind: _, ...options } = config;
  const ttl_ms = o.lease_ttl_ms ?? LEASE_DEFAULTS.ttl_ms;
  const holder = o.holder ?? replicaName();
  const db = await PostgresDb.open(
    // A transaction stalled longer than a lease is ended by the server (see PostgresDb).
    { idle_in_transaction_timeout_ms: ttl_ms, application_name: `thermargin ${holder}`, ...options },
    o.log,
  );
  const changes = createPostgresChanges(db, o.log);
  return {
    kind: 'postgres',
    analysis: createPostgresAnalysisStore(db),
    workflow: createPostgresWorkflowStore(db),
    leases: createPostgresLeases(db, holder, ttl_ms),
    changes,
    async close() {
      await changes.close();
      await db.close();
    },
  };
}
