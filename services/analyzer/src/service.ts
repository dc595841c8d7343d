import { statSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { type Env, envReader } from '@thermargin/shared/env';
import type { Logger } from '@thermargin/shared/log';
import { openSampleStore } from '@thermargin/store';
import { openResults } from '@thermargin/store/results-backend';
import { type DeploymentConfig, readDeploymentConfig } from '@thermargin/usecases/config';
import { type LoadedFleet, loadFleetFile } from '@thermargin/usecases/fleet-file';
import { type Analyzer, createAnalyzer } from './analyzer.ts';
import { type AnalyzerConfig, readAnalyzerConfig } from './config.ts';

/** Variables of the analyzer as a process of its own (besides ANALYZER_ENV). */
export const ANALYZER_PROCESS_ENV = {
  HEALTH_PORT: 'ANALYZER_HEALTH_PORT',
  HEALTH_HOST: 'ANALYZER_HEALTH_HOST',
  REPLICA: 'ANALYZER_REPLICA',
  LEASE_TTL_MS: 'ANALYZER_LEASE_TTL_MS',
} as const;

export interface AnalyzerProcessConfig {
  /** The fleet file and the stores (FLEET_FILE, STORE_*, RESULTS_*). */
  deployment: DeploymentConfig;
  analyzer: AnalyzerConfig;
  /** 0: no health endpoint. */
  health_port: number;
  health_host: string;
  /** Name in the lease table and analysis log; default host-pid-random. */
  replica: string | undefined;
  lease_ttl_ms: number | undefined;
}

export function readAnalyzerProcessConfig(env: Env = process.env): AnalyzerProcessConfig {
  const problems: string[] = [];
  const { int } = envReader(env, problems);
  const config = {
    deployment: readDeploymentConfig(env, problems),
    analyzer: readAnalyzerConfig(env, problems),
    health_port: int(ANALYZER_PROCESS_ENV.HEALTH_PORT, 0, 0),
    health_host: env[ANALYZER_PROCESS_ENV.HEALTH_HOST] || '127.0.0.1',
    replica: env[ANALYZER_PROCESS_ENV.REPLICA] || undefined,
    lease_ttl_ms: env[ANALYZER_PROCESS_ENV.LEASE_TTL_MS]
      ? int(ANALYZER_PROCESS_ENV.LEASE_TTL_MS, 0, 1000)
      : undefined,
  };
  if (problems.length) throw new Error(`analyzer configuration:\n  ${problems.join('\n  ')}`);
  return config;
}

export interface AnalyzerProcess {
  analyzer: Analyzer;
  /** The health endpoint's port (0 when none). */
  health_port: number;
  stop(): Promise<void>;
}

/** The fleet file, loaded again when it changes on disk (an API's PUT /api/fleet, an edit). */
function watchedFleet(path: string, log: Logger): () => LoadedFleet {
  let fleet = loadFleetFile(path);
  let mtime = statSync(path).mtimeMs;
  return () => {
    try {
      const now = statSync(path).mtimeMs;
      if (now !== mtime) {
        fleet = loadFleetFile(path);
        mtime = now;
        log('fleet_reloaded', { vehicles: fleet.models.size });
      }
    } catch (e) {
      log('fleet_reload_failed', { error: (e as Error).message }); // keeps the last good fleet
    }
    return fleet;
  };
}

/**
 * The analyzer as a service of its own: the sample store, the results database (with leases when it
 * is PostgreSQL, so several such processes share the fleet), polling; `GET /health` answers 200 while
 * passes succeed, 503 after a failed one (for the orchestrator's health check).
 */
export async function startAnalyzerProcess(c: AnalyzerProcessConfig, log: Logger): Promise<AnalyzerProcess> {
  const fleet = watchedFleet(c.deployment.fleet_file, log);
  const samples = openSampleStore(c.deployment.samples);
  const results = await openResults(c.deployment.results, {
    log,
    ...(c.replica ? { holder: c.replica } : {}),
    ...(c.lease_ttl_ms ? { lease_ttl_ms: c.lease_ttl_ms } : {}),
  });
  const analyzer = createAnalyzer(
    {
      samples,
      results: results.analysis,
      fleet: () => fleet().models,
      extraMaintenance: async (v) => (await results.workflow.maintenance(v)).map((m) => m.entry),
      ...(results.leases ? { leases: results.leases } : {}),
      log,
    },
    { poll_ms: c.analyzer.poll_ms },
  );
  analyzer.start();
  log('analyzer_started', { results: results.kind, replica: results.leases?.holder ?? 'sole' });
  let server: Server | undefined;
  if (c.health_port > 0) {
    server = createServer((_req, res) => {
      const s = analyzer.stats;
      res.writeHead(s.last_error === null ? 200 : 503, { 'content-type': 'application/json' });
      res.end(JSON.stringify({ ...s, replica: results.leases?.holder ?? null }));
    });
    await new Promise<void>((r) => server!.listen(c.health_port, c.health_host, r));
  }
  return {
    analyzer,
    health_port: server ? (server.address() as AddressInfo).port : 0,
    async stop() {
      await analyzer.stop();
      server?.close();
      await results.close();
      await samples.close();
    },
  };
}
