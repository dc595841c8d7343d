import { existsSync, readFileSync } from 'node:fs';
import { DEFAULT_CONNECTIONS, ENV, readIngesterConfig } from '@thermargin/ingester/config';
import { STORE_ENV } from '@thermargin/store/config';
import { describe, expect, it } from 'vitest';

/**
 * docker-compose.yml cannot run here (no Docker engine), so its structure is checked. It is written in
 * YAML's JSON-like flow style; the repository's formatter adds trailing commas there (valid YAML), which
 * are the one thing removed before JSON.parse (no string in the file contains `,}` or `,]`).
 */
interface Service {
  image: string;
  ports?: string[];
  command?: string[];
  environment?: Record<string, string>;
  volumes?: string[];
}
const compose = JSON.parse(readFileSync('docker-compose.yml', 'utf8').replace(/,(\s*[}\]])/g, '$1')) as {
  services: Record<string, Service>;
};
const ingesters = Object.entries(compose.services).filter(([name]) => name.startsWith('ingester'));

describe('docker-compose.yml', () => {
  it('has Mosquitto with the shipped auth/ACL config, InfluxDB 2 with its initial setup, two ingesters', () => {
    const m = compose.services.mosquitto!;
    expect(m.volumes).toContain('./config/mosquitto:/mosquitto/config:ro');
    expect(m.ports).toEqual(['1883:1883']);
    const conf = readFileSync('config/mosquitto/mosquitto.conf', 'utf8');
    expect(conf).toMatch(/^allow_anonymous false$/m);
    for (const f of ['passwd', 'passwd-ingesters', 'acl']) {
      expect(conf).toContain(`/mosquitto/config/${f}`);
      expect(existsSync(`config/mosquitto/${f}`)).toBe(true);
    }
    const i = compose.services.influxdb!;
    expect(i.image).toMatch(/^influxdb:2/);
    for (const v of ['MODE', 'USERNAME', 'PASSWORD', 'ORG', 'BUCKET', 'ADMIN_TOKEN']) {
      expect(i.environment?.[`DOCKER_INFLUXDB_INIT_${v}`]).toBeTruthy();
    }
    expect(ingesters).toHaveLength(2);
  });

  it('runs each ingester with the real entry point and only env vars the config module reads', () => {
    const known = new Set<string>([...Object.values(ENV), ...Object.values(STORE_ENV)]);
    const init = compose.services.influxdb!.environment!;
    const ids = new Set<string>();
    for (const [, s] of ingesters) {
      expect(s.command).toEqual(['node', '--import', 'tsx', 'services/ingester/src/main.ts']);
      expect(existsSync(s.command![3]!)).toBe(true);
      const env = s.environment!;
      expect(Object.keys(env).filter((k) => !known.has(k))).toEqual([]);
      const config = readIngesterConfig(env);
      expect(config.mqtt.share_group).toBe('ingesters');
      // The ingesters' own listener (client ids their own), not the vehicles' one that is published.
      expect(config.mqtt.url).toBe('mqtt://mosquitto:1884');
      expect(config.store).toMatchObject({
        kind: 'influx',
        api: 'v2',
        org: init.DOCKER_INFLUXDB_INIT_ORG,
        bucket: init.DOCKER_INFLUXDB_INIT_BUCKET,
        token: init.DOCKER_INFLUXDB_INIT_ADMIN_TOKEN,
      });
      ids.add(config.mqtt.client_id);
    }
    expect(ids.size).toBe(2); // distinct persistent sessions in one share group
  });

  it("lets one ingester read Mosquitto's log file, where the broker says what it refused", () => {
    const conf = readFileSync('config/mosquitto/mosquitto.conf', 'utf8');
    const file = /^log_dest file (\/mosquitto\/log\/\S+)$/m.exec(conf)?.[1];
    expect(file).toBeDefined();
    for (const type of ['notice', 'debug']) expect(conf).toMatch(new RegExp(`^log_type ${type}$`, 'm'));
    expect(compose.services.mosquitto!.volumes).toContain('mosquitto-log:/mosquitto/log');
    // One follower: every replica following it would count each refusal once per replica.
    const followers = ingesters.filter(([, s]) => readIngesterConfig(s.environment!).broker_log);
    expect(followers).toHaveLength(1);
    const [, follower] = followers[0]!;
    const mount = follower.volumes!.find((v) => v.startsWith('mosquitto-log:'))!.split(':')[1]!;
    expect(readIngesterConfig(follower.environment!).broker_log).toBe(file!.replace('/mosquitto/log', mount));
  });
});

describe('readIngesterConfig', () => {
  it('defaults to SQLite and MQTT 5 with a shared subscription', () => {
    const c = readIngesterConfig({ [ENV.FLEET_FILE]: 'fleet.json' });
    expect(c.store).toEqual({ kind: 'sqlite', path: 'data/thermargin.db', synchronous: 'full' });
    expect(c.mqtt).toMatchObject({ protocol: 5, share_group: 'ingesters', connections: DEFAULT_CONNECTIONS });
  });
  it('names every bad variable', () => {
    const bad = () =>
      readIngesterConfig({ [ENV.CONNECTIONS]: 'many', [STORE_ENV.KIND]: 'mongo', [ENV.MQTT_PROTOCOL]: '4' });
    for (const rule of [
      /INGEST_CONNECTIONS must be an integer ≥ 1 \(got "many"\)/,
      /STORE_KIND must be one of sqlite, influx/,
      /INGEST_FLEET_FILE is required/,
      /INGEST_SHARE_GROUP needs INGEST_MQTT_PROTOCOL=5/,
    ]) {
      expect(bad).toThrow(rule);
    }
  });
});
