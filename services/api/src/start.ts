import type { AddressInfo } from 'node:net';
import type { Analyzer } from '@thermargin/analyzer/analyzer';
import type { Logger } from '@thermargin/shared/log';
import { serve } from '@hono/node-server';
import { createApi } from './app.ts';
import { type ApiConfig, readApiConfig } from './config.ts';
import { type ApiPieces, wireApi } from './wiring.ts';

export interface StartApiOptions {
  /** Overrides API_PORT; 0 picks a free port. */
  port?: number;
  env?: Record<string, string | undefined>;
  clock?: () => number;
  log?: Logger;
}

export interface RunningApi {
  url: string;
  port: number;
  /** The in-process analyzer (API_RUN_ANALYZER=1): `poke()` it after an ingest. */
  analyzer: Analyzer | undefined;
  close(): Promise<void>;
}

/** Service events as JSON lines on stderr. */
const stderrLog: Logger = (event, detail) =>
  process.stderr.write(`${JSON.stringify({ event, ...detail })}\n`);

/** The API process: its pieces from the environment (wireApi), served over HTTP. */
export async function startApi(options: StartApiOptions = {}): Promise<RunningApi> {
  const config = readApiConfig(options.env ?? process.env);
  const clock = options.clock ?? Date.now;
  const log = options.log ?? stderrLog;
  return serveApi(await wireApi(config, { clock, log }), config, { ...options, clock, log });
}

/** Serves the API over `pieces` on the configured host and port; closing it closes the pieces too. */
export async function serveApi(
  pieces: ApiPieces,
  config: ApiConfig,
  options: { port?: number; clock: () => number; log: Logger },
): Promise<RunningApi> {
  const { analyzer } = pieces;
  const app = createApi({
    samples: pieces.samples,
    results: pieces.results,
    workflow: pieces.workflow,
    ...(pieces.changes ? { changes: pieces.changes } : {}),
    fleet: pieces.fleet,
    tokens: pieces.tokens,
    ...(analyzer ? { analyzer } : {}),
    clock: options.clock,
    log: options.log,
    web_dist: config.web_dist,
    cors_origins: config.cors_origins,
    rate_limit: config.rate_limit,
  });
  const server = serve({ fetch: app.fetch, port: options.port ?? config.port, hostname: config.host });
  await new Promise<void>((resolve, reject) => {
    server.once('listening', resolve);
    server.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://${config.host}:${port}`,
    port,
    analyzer,
    async close() {
      await analyzer?.stop();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        (server as unknown as { closeAllConnections?: () => void }).closeAllConnections?.();
      });
      await pieces.close();
    },
  };
}
