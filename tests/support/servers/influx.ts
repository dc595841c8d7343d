import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort, waitFor } from './free-port.ts';
import { retryOnPortClash, ServerProcess } from './process.ts';

/** Debian's InfluxDB 1.6 (the only one installable here), on a free loopback port in a temp dir. */
export const INFLUXD = '/usr/bin/influxd';

export interface InfluxServer {
  url: string;
  dir: string;
  process: ServerProcess;
  /** Creates a database (1.x has no buckets; the adapter's "bucket" is `db/rp`). */
  createDatabase(name: string): Promise<void>;
  close(): Promise<void>;
}

export function startInflux(): Promise<InfluxServer> {
  return retryOnPortClash(startOnFreshPorts);
}

async function startOnFreshPorts(): Promise<InfluxServer> {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-influx-'));
  const [port, rpcPort] = [await freePort(), await freePort()];
  const conf = join(dir, 'influxdb.conf');
  writeFileSync(
    conf,
    `reporting-disabled = true
bind-address = "127.0.0.1:${rpcPort}"
[meta]
  dir = "${dir}/meta"
[data]
  dir = "${dir}/data"
  wal-dir = "${dir}/wal"
  query-log-enabled = false
[http]
  enabled = true
  bind-address = "127.0.0.1:${port}"
  log-enabled = false
  max-body-size = 0
[monitor]
  store-enabled = false
[continuous_queries]
  enabled = false
[subscriber]
  enabled = false
[logging]
  level = "warn"
`,
  );
  const url = `http://127.0.0.1:${port}`;
  const ping = async () => (await fetch(`${url}/ping`)).status === 204;
  const proc = new ServerProcess(
    'influxd',
    INFLUXD,
    ['run', '-config', conf],
    join(dir, 'influxd.log'),
    port,
    () => waitFor('influxd', ping),
  );
  await proc.start().catch((e) => {
    rmSync(dir, { recursive: true, force: true });
    throw e;
  });
  return {
    url,
    dir,
    process: proc,
    async createDatabase(name) {
      const r = await fetch(`${url}/query`, {
        method: 'POST',
        body: new URLSearchParams({ q: `CREATE DATABASE "${name}"` }),
      });
      // InfluxQL reports a failed statement with HTTP 200 and an `error` in its result.
      const body = await r.text();
      if (!r.ok || body.includes('"error"'))
        throw new Error(`createDatabase ${name}: HTTP ${r.status} ${body}`);
    },
    async close() {
      await proc.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
