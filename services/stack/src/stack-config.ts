import { readFileSync } from 'node:fs';
import { decimalNumber } from '@thermargin/shared';
import type { Env } from '@thermargin/shared/env';

/**
 * The variables of `npm start` itself. Everything else goes to the services unchanged, so the same
 * INGEST_*, STORE_*, FLEET_FILE, RESULTS_* and API_* variables point the stack at an external
 * Mosquitto and InfluxDB (see the services' READMEs). Each default is defined here once.
 */
export const STACK_ENV = {
  CONFIG: 'THERMARGIN_CONFIG',
  DATA_DIR: 'THERMARGIN_DATA_DIR',
  BROKER_PORT: 'THERMARGIN_BROKER_PORT',
  SIMULATE: 'THERMARGIN_SIMULATE',
  DEMO_VEHICLES: 'THERMARGIN_DEMO_VEHICLES',
  DEMO_DAYS: 'THERMARGIN_DEMO_DAYS',
  DEMO_SEED: 'THERMARGIN_DEMO_SEED',
  DEMO_FRAMES: 'THERMARGIN_DEMO_FRAMES',
  SPEEDUP: 'THERMARGIN_SPEEDUP',
  RUN_FOR_S: 'THERMARGIN_RUN_FOR_S',
  VEHICLE_MQTT_URL: 'THERMARGIN_VEHICLE_MQTT_URL',
} as const;

export interface StackConfig {
  /** Folder of the embedded store, the spool, the generated fleet file and the demo's secrets. */
  data_dir: string;
  /** 1883: port of the embedded broker (0 picks a free one); unused when INGEST_MQTT_URL is given. */
  broker_port: number;
  /** true: the simulated demo fleet publishes its history and then drives live. */
  simulate: boolean;
  vehicles: number;
  days: number;
  seed: number;
  /** Demo vehicles whose loggers send SAE J1939 frames instead of samples (every third; 0: none). */
  frames: number;
  /** 1: live simulated time per wall-clock time. */
  speedup: number;
  /** s, 0 = until Ctrl-C: stop by itself after this long (smoke tests). */
  run_for_s: number;
  /**
   * Where the demo's vehicles publish on an external broker (its vehicles' listener); default
   * INGEST_MQTT_URL. Unused with the embedded broker.
   */
  vehicle_mqtt_url: string | undefined;
  /** The environment with the config file's entries under it (the environment wins). */
  env: Record<string, string | undefined>;
}

/** The optional config file: a JSON object of the same variable names, e.g. {"STORE_KIND": "influx"}. */
function configFile(path: string | undefined): Env {
  if (!path) return {};
  const data = JSON.parse(readFileSync(path, 'utf8')) as unknown;
  if (typeof data !== 'object' || data === null || Array.isArray(data))
    throw new Error(`${path}: must be a JSON object of variable names to values`);
  return Object.fromEntries(Object.entries(data).map(([k, v]) => [k, String(v)]));
}

export function readStackConfig(processEnv: Env = process.env): StackConfig {
  const env = { ...configFile(processEnv[STACK_ENV.CONFIG]), ...processEnv };
  const problems: string[] = [];
  const num = (name: string, fallback: number, ok: (x: number) => boolean, rule: string) => {
    const raw = env[name];
    if (raw === undefined || raw === '') return fallback;
    const x = decimalNumber(raw);
    if (!ok(x)) problems.push(`${name} ${rule} (got ${JSON.stringify(raw)})`);
    return x;
  };
  const int = (x: number) => Number.isInteger(x) && x >= 0;
  const config: StackConfig = {
    data_dir: env[STACK_ENV.DATA_DIR] || 'data',
    broker_port: num(STACK_ENV.BROKER_PORT, 1883, int, 'must be an integer ≥ 0'),
    simulate: (env[STACK_ENV.SIMULATE] ?? '1') !== '0',
    vehicles: num(STACK_ENV.DEMO_VEHICLES, 10, (x) => int(x) && x >= 1, 'must be an integer ≥ 1'),
    days: num(STACK_ENV.DEMO_DAYS, 21, (x) => int(x) && x >= 1, 'must be an integer ≥ 1'),
    seed: num(STACK_ENV.DEMO_SEED, 1, int, 'must be an integer ≥ 0'),
    frames: num(STACK_ENV.DEMO_FRAMES, -1, int, 'must be an integer ≥ 0'),
    speedup: num(STACK_ENV.SPEEDUP, 1, (x) => x > 0 && x <= 3600, 'must be a number in (0, 3600]'),
    run_for_s: num(STACK_ENV.RUN_FOR_S, 0, (x) => x >= 0, 'must be a number ≥ 0'),
    vehicle_mqtt_url: env[STACK_ENV.VEHICLE_MQTT_URL] || env.INGEST_MQTT_URL || undefined,
    env,
  };
  if (problems.length) throw new Error(`start configuration:\n  ${problems.join('\n  ')}`);
  // By default a third of the fleet logs frames (with 10 vehicles: 3, the truck among them).
  if (config.frames < 0) config.frames = Math.floor(config.vehicles / 3);
  return config;
}
