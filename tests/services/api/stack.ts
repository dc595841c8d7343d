import { writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { type Analyzer, createAnalyzer } from '@thermargin/analyzer/analyzer';
import { fileFleetSource } from '@thermargin/api/fleet-source';
import { createApi } from '@thermargin/api/app';
import type { ApiDeps } from '@thermargin/api/deps';
import { parseTokenList, TokenRegistry } from '@thermargin/api/tokens';
import type { FleetInput } from '@thermargin/shared';
import type { SampleStore } from '@thermargin/store';
import {
  type AnalysisStore,
  createAnalysisStore,
  openResultsDb,
} from '@thermargin/store/sqlite-analysis-store';
import { createWorkflowStore, type WorkflowStore } from '@thermargin/store/sqlite-workflow';
import { serve } from '@hono/node-server';

/** Documented test tokens (never used outside tests), one per role. */
export const TOKENS = {
  viewer: 'test-viewer-token-0001',
  engineer: 'test-engineer-token-0001',
  admin: 'test-admin-token-00001',
} as const;

export interface ApiStack {
  url: string;
  results: AnalysisStore;
  workflow: WorkflowStore;
  analyzer: Analyzer;
  fleetFile: string;
  /** `role` null: no token. */
  get(path: string, role?: keyof typeof TOKENS | null): Promise<Response>;
  send(
    method: string,
    path: string,
    body: unknown,
    role?: keyof typeof TOKENS,
    raw?: boolean,
  ): Promise<Response>;
  close(): Promise<void>;
}

/** The API over real HTTP on a free loopback port, with its analyzer, over `samples` and SQLite results in `dir`. */
export async function startApiStack(
  dir: string,
  fleet: FleetInput,
  samples: SampleStore,
  now: () => number,
  /** More of the API's dependencies (a log, limits), over the ones set here. */
  more: Partial<ApiDeps> = {},
): Promise<ApiStack> {
  const fleetFile = join(dir, 'fleet.json');
  writeFileSync(fleetFile, JSON.stringify(fleet));
  const source = fileFleetSource(fleetFile);
  const apiDb = openResultsDb(join(dir, 'results.db'));
  const results = createAnalysisStore(apiDb);
  const workflow = createWorkflowStore(apiDb);
  const anDb = openResultsDb(join(dir, 'results.db'));
  const anResults = createAnalysisStore(anDb);
  const anWorkflow = createWorkflowStore(anDb);
  const analyzer = createAnalyzer({
    samples,
    results: anResults,
    fleet: () => source.current().models,
    extraMaintenance: async (v) => (await anWorkflow.maintenance(v)).map((m) => m.entry),
    clock: now,
  });
  const tokens = parseTokenList(
    Object.entries(TOKENS)
      .map(([role, t]) => `${role}-user:${role}:${t}`)
      .join(','),
    'env',
  );
  const app = createApi({
    samples,
    results,
    workflow,
    fleet: source,
    tokens: new TokenRegistry(tokens, workflow),
    analyzer,
    clock: now,
    events_poll_ms: 100,
    rate_limit: { per_minute: 60_000, burst: 10_000 },
    ...more,
  });
  const server = serve({ fetch: app.fetch, port: 0, hostname: '127.0.0.1' }) as Server;
  // Client and server share this process: a test step that holds the event loop (an analyzer run, a
  // CLI via spawnSync) past Node's 5 s keep-alive default lets the server drop an idle socket just as
  // the client reuses it (ECONNRESET).
  server.keepAliveTimeout = 120_000;
  await new Promise<void>((r) => server.once('listening', r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const auth = (role?: keyof typeof TOKENS | null): Record<string, string> =>
    role ? { authorization: `Bearer ${TOKENS[role]}` } : {};
  return {
    url,
    results,
    workflow,
    analyzer,
    fleetFile,
    get: (path, role = 'viewer') => fetch(`${url}${path}`, { headers: auth(role) }),
    send: (method, path, body, role, raw = false) =>
      fetch(`${url}${path}`, {
        method,
        headers: { ...auth(role), 'content-type': 'application/json' },
        body: raw ? (body as string) : JSON.stringify(body),
      }),
    async close() {
      await analyzer.stop();
      await new Promise<void>((r) => {
        server.close(() => r());
        server.closeAllConnections();
      });
      await anResults.close();
      await results.close();
    },
  };
}
