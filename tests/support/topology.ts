import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { interpolate, readCompose, readEnvFile, ROOT } from '../deploy/compose-file.ts';
import { freePort, waitFor } from './servers/free-port.ts';
import { type InfluxServer, startInflux } from './servers/influx.ts';
import { type MosquittoServer, startMosquitto } from './servers/mosquitto.ts';
import { type PostgresServer, startPostgres } from './servers/postgres.ts';
import { ServiceProcess } from './service-process.ts';

export const TOPOLOGY_TOKEN = 'test-admin-token-topology-01';

export interface TopologyOptions {
  fleetFile: string;
  /** Vehicle ids that publish (each gets a broker login `test-<id>-pw`). */
  vehicles: readonly string[];
  /** Extra variables for every service (e.g. ANALYZER_POLL_MS). */
  env?: Record<string, string>;
}

export interface Topology {
  mosquitto: MosquittoServer;
  influx: InfluxServer;
  postgres: PostgresServer;
  /** docker-compose.yml's own services (ingester-1 …, analyzer-1 …, api) as processes, by name. */
  services: Map<string, ServiceProcess>;
  apiUrl: string;
  resultsUrl: string;
  /** Each service's health URL (compose's health check, on its local port), by name. */
  health: Map<string, string>;
  password(user: string): string;
  stop(): Promise<void>;
}

/**
 * docker-compose.yml's topology as processes on real servers: Debian's Mosquitto (with the ACL rules),
 * InfluxDB (1.6 here, so the services' STORE_INFLUX_API becomes v1 on database `telemetry`) and
 * PostgreSQL 15; each thermargin service runs the compose file's own command with its own environment,
 * host names and ports mapped to the local servers, secrets from .env.example.
 */
export async function startTopology(o: TopologyOptions): Promise<Topology> {
  const compose = readCompose();
  const secrets = readEnvFile(join(ROOT, '.env.example'));
  const password = (user: string) => `test-${user}-pw`;
  const mosquitto = await startMosquitto([
    { username: 'ingester', password: password('ingester'), role: 'ingester' },
    ...o.vehicles.map((id) => ({ username: id, password: password(id), role: 'vehicle' as const })),
  ]);
  const influx = await startInflux();
  await influx.createDatabase('telemetry');
  const postgres = await startPostgres();
  const resultsUrl = await postgres.createDatabase('thermargin');
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-topology-'));
  const services = new Map<string, ServiceProcess>();
  const health: { name: string; url: string }[] = [];
  let apiUrl = '';
  for (const [name, s] of Object.entries(compose.services)) {
    if (!s.command) continue; // the servers above stand in for the images
    const env: Record<string, string> = {};
    for (const [k, v] of Object.entries(s.environment ?? {})) env[k] = interpolate(v, secrets);
    const local: Record<string, string> = {};
    if ('INGEST_MQTT_URL' in env) {
      const port = await freePort();
      Object.assign(local, {
        // The compose file's listener, by its port: 1884 the ingesters', 1883 the vehicles'.
        INGEST_MQTT_URL: env.INGEST_MQTT_URL!.endsWith(':1884') ? mosquitto.ingester_url : mosquitto.url,
        INGEST_MQTT_PASSWORD: password('ingester'),
        INGEST_FLEET_FILE: o.fleetFile,
        INGEST_SPOOL_DIR: join(dir, name, 'spool'),
        INGEST_METRICS_HOST: '127.0.0.1',
        INGEST_METRICS_PORT: String(port),
      });
      health.push({ name, url: `http://127.0.0.1:${port}/metrics` });
    }
    if ('STORE_INFLUX_URL' in env) {
      for (const k of ['STORE_INFLUX_ORG', 'STORE_INFLUX_BUCKET', 'STORE_INFLUX_TOKEN']) delete env[k];
      Object.assign(local, {
        STORE_INFLUX_URL: influx.url,
        STORE_INFLUX_API: 'v1',
        STORE_INFLUX_DATABASE: 'telemetry',
      });
    }
    if ('RESULTS_POSTGRES_URL' in env) local.RESULTS_POSTGRES_URL = resultsUrl;
    if ('FLEET_FILE' in env) local.FLEET_FILE = o.fleetFile;
    if ('ANALYZER_HEALTH_PORT' in env) {
      const port = await freePort();
      local.ANALYZER_HEALTH_PORT = String(port);
      health.push({ name, url: `http://127.0.0.1:${port}/health` });
    }
    if ('API_PORT' in env) {
      const port = await freePort();
      apiUrl = `http://127.0.0.1:${port}`;
      Object.assign(local, {
        API_PORT: String(port),
        API_HOST: '127.0.0.1',
        API_TOKENS: `topology:admin:${TOPOLOGY_TOKEN}`,
        API_WEB_DIST: join(ROOT, 'web/dist'),
      });
      health.push({ name, url: `${apiUrl}/api/health` });
    }
    services.set(name, new ServiceProcess(name, s.command.at(-1)!, { ...env, ...local, ...o.env }).start());
  }
  const stop = async () => {
    for (const s of services.values()) await s.stop('SIGTERM');
    await mosquitto.close();
    await influx.close();
    await postgres.close();
  };
  try {
    for (const h of health)
      await waitFor(
        `${h.name} healthy`,
        async () => {
          if (!services.get(h.name)!.running)
            throw new Error(`${h.name} exited:\n${services.get(h.name)!.log()}`);
          return (await fetch(h.url)).ok;
        },
        120_000,
      );
  } catch (e) {
    await stop();
    throw e;
  }
  return {
    mosquitto,
    influx,
    postgres,
    services,
    apiUrl,
    resultsUrl,
    health: new Map(health.map((h) => [h.name, h.url])),
    password,
    stop,
  };
}
