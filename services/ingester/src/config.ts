import { hostname } from 'node:os';
import { DEFAULT_MAX_PAYLOAD_BYTES, DEFAULT_SHARE_GROUP } from '@thermargin/shared';
import { type Env, envReader } from '@thermargin/shared/env';
import { readStoreConfig, type StoreConfig } from '@thermargin/store/config';
import { PIPELINE_DEFAULTS } from './pipeline.ts';

/**
 * MQTT connections per replica. Each carries one message per store write, so this sets how many samples
 * are in flight: with 250-sample messages, 48 keep InfluxDB's writes near its best batch size (16 left
 * them half that and latency-bound; figures in DEVELOPERS.md, bench:ingest).
 */
export const DEFAULT_CONNECTIONS = 48;

/**
 * The environment variables the ingester reads besides the store's STORE_* (services/store): the one
 * list (docker-compose.yml and the README are checked against both). Each default is defined once, in
 * `readIngesterConfig`.
 */
export const ENV = {
  MQTT_URL: 'INGEST_MQTT_URL',
  MQTT_USERNAME: 'INGEST_MQTT_USERNAME',
  MQTT_PASSWORD: 'INGEST_MQTT_PASSWORD',
  MQTT_CLIENT_ID: 'INGEST_MQTT_CLIENT_ID',
  MQTT_PROTOCOL: 'INGEST_MQTT_PROTOCOL',
  SHARE_GROUP: 'INGEST_SHARE_GROUP',
  CONNECTIONS: 'INGEST_CONNECTIONS',
  SESSION_EXPIRY_S: 'INGEST_SESSION_EXPIRY_S',
  FLEET_FILE: 'INGEST_FLEET_FILE',
  MAX_PAYLOAD_BYTES: 'INGEST_MAX_PAYLOAD_BYTES',
  DECODE_WORKERS: 'INGEST_DECODE_WORKERS',
  BATCH_SAMPLES: 'INGEST_BATCH_SAMPLES',
  LINGER_MS: 'INGEST_LINGER_MS',
  SPOOL_DIR: 'INGEST_SPOOL_DIR',
  SPOOL_MAX_BYTES: 'INGEST_SPOOL_MAX_BYTES',
  METRICS_PORT: 'INGEST_METRICS_PORT',
  METRICS_HOST: 'INGEST_METRICS_HOST',
  BROKER_LOG: 'INGEST_BROKER_LOG',
} as const;

export interface IngesterConfig {
  mqtt: {
    url: string;
    username: string | undefined;
    password: string | undefined;
    /** Stable per replica: the persistent sessions are `${client_id}-0` … `-${connections - 1}`. */
    client_id: string;
    /** 5 (MQTT 5: session expiry, shared subscriptions) or 4 (MQTT 3.1.1, e.g. the embedded broker). */
    protocol: 4 | 5;
    /** Shared-subscription group; '' subscribes plainly (one ingester only). */
    share_group: string;
    /** MQTT connections of this replica (each has one message in flight at a time). */
    connections: number;
    session_expiry_s: number;
  };
  fleet_file: string;
  max_payload_bytes: number;
  /** Worker threads that decode payloads (0: the main thread decodes; see README "Throughput"). */
  decode_workers: number;
  batch_samples: number;
  linger_ms: number;
  spool_dir: string;
  spool_max_bytes: number;
  /** -1: no metrics server; 0: any free port. */
  metrics_port: number;
  metrics_host: string;
  /**
   * Mosquitto's log file, followed for the logins and publishes it refused (recorded as refused
   * messages); '' when not followed. One replica only, or each refusal is counted once per replica.
   */
  broker_log: string;
  store: StoreConfig;
}

/** The ingester's configuration from environment variables, or an Error naming each bad one. */
export function readIngesterConfig(env: Env = process.env): IngesterConfig {
  const problems: string[] = [];
  const { str, int, oneOf } = envReader(env, problems);
  const store = readStoreConfig(env, problems);

  const config: IngesterConfig = {
    mqtt: {
      url: str(ENV.MQTT_URL, 'mqtt://127.0.0.1:1883'),
      username: env[ENV.MQTT_USERNAME] || undefined,
      password: env[ENV.MQTT_PASSWORD] || undefined,
      client_id: str(ENV.MQTT_CLIENT_ID, `ingester-${hostname()}`),
      protocol: Number(oneOf(ENV.MQTT_PROTOCOL, ['5', '4'] as const, '5')) as 4 | 5,
      share_group: env[ENV.SHARE_GROUP] ?? DEFAULT_SHARE_GROUP,
      connections: int(ENV.CONNECTIONS, DEFAULT_CONNECTIONS, 1),
      session_expiry_s: int(ENV.SESSION_EXPIRY_S, 7 * 86_400, 1),
    },
    fleet_file: str(ENV.FLEET_FILE),
    max_payload_bytes: int(ENV.MAX_PAYLOAD_BYTES, DEFAULT_MAX_PAYLOAD_BYTES, 1),
    decode_workers: int(ENV.DECODE_WORKERS, 0, 0),
    batch_samples: int(ENV.BATCH_SAMPLES, PIPELINE_DEFAULTS.batch_samples, 1),
    linger_ms: int(ENV.LINGER_MS, PIPELINE_DEFAULTS.linger_ms, 0),
    spool_dir: str(ENV.SPOOL_DIR, 'data/spool'),
    spool_max_bytes: int(ENV.SPOOL_MAX_BYTES, 1024 ** 3, 1),
    metrics_port: int(ENV.METRICS_PORT, 9464, -1),
    metrics_host: str(ENV.METRICS_HOST, '127.0.0.1'),
    broker_log: env[ENV.BROKER_LOG] ?? '',
    store,
  };
  if (config.mqtt.protocol === 4 && config.mqtt.share_group) {
    problems.push(
      `${ENV.SHARE_GROUP} needs ${ENV.MQTT_PROTOCOL}=5 (shared subscriptions are MQTT 5); set it to ''`,
    );
  }
  if (problems.length) throw new Error(`ingester configuration:\n  ${problems.join('\n  ')}`);
  return config;
}
