import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { type BrokerUser, renderMosquittoAcl } from '@thermargin/broker/acl';
import { freePort, waitFor } from './free-port.ts';
import { retryOnPortClash, ServerProcess } from './process.ts';

/** Debian's Mosquitto 2.0 with our auth/ACL rules, on a free loopback port in a temp dir. */
export const MOSQUITTO = '/usr/sbin/mosquitto';
export const MOSQUITTO_PASSWD = '/usr/bin/mosquitto_passwd';

export interface MosquittoServer {
  /** The vehicles' listener (client id = user name). */
  url: string;
  port: number;
  /** The ingesters' listener. */
  ingester_url: string;
  /** The broker's own log (the shipped config's file), where it says what it refused. */
  log_file: string;
  dir: string;
  process: ServerProcess;
  close(): Promise<void>;
}

const SHIPPED_CONF = join(import.meta.dirname, '../../../config/mosquitto/mosquitto.conf');

/**
 * The shipped config/mosquitto/mosquitto.conf itself, with the temp dir's paths and free ports for its
 * two listeners (vehicles, ingesters): the password files are generated with `mosquitto_passwd -b`
 * from the test users given (never a real one), vehicles in `passwd`, ingesters in `passwd-ingesters`.
 */
export function startMosquitto(users: readonly BrokerUser[]): Promise<MosquittoServer> {
  return retryOnPortClash(() => startOnFreshPort(users));
}

async function startOnFreshPort(users: readonly BrokerUser[]): Promise<MosquittoServer> {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-mosquitto-'));
  const port = await freePort();
  const ingesterPort = await freePort();
  for (const [file, role] of [
    ['passwd', 'vehicle'],
    ['passwd-ingesters', 'ingester'],
  ] as const) {
    writeFileSync(join(dir, file), '');
    for (const u of users.filter((x) => x.role === role))
      execFileSync(MOSQUITTO_PASSWD, ['-b', join(dir, file), u.username, u.password]);
  }
  writeFileSync(join(dir, 'acl'), renderMosquittoAcl(users));
  const conf = join(dir, 'mosquitto.conf');
  const shipped = readFileSync(SHIPPED_CONF, 'utf8')
    .replace(/^listener 1883$/m, `listener ${port} 127.0.0.1`)
    .replace(/^listener 1884$/m, `listener ${ingesterPort} 127.0.0.1`)
    .replaceAll('/mosquitto/config/', `${dir}/`)
    .replaceAll('/mosquitto/data/', `${dir}/`)
    .replaceAll('/mosquitto/log/', `${dir}/log/`);
  mkdirSync(join(dir, 'log'));
  // Started as root, Mosquitto switches to its own user, which cannot read this private temp dir. The
  // tests publish faster than a vehicle: no cap on QoS 1 messages in flight per client.
  const runAsRoot = process.getuid?.() === 0;
  writeFileSync(conf, `${runAsRoot ? 'user root\n' : ''}max_inflight_messages 0\n${shipped}`);
  const reachable = () =>
    new Promise<boolean>((resolve) => {
      const socket = connect(port, '127.0.0.1', () => {
        socket.destroy();
        resolve(true);
      });
      socket.on('error', () => resolve(false));
    });
  const proc = new ServerProcess('mosquitto', MOSQUITTO, ['-c', conf], join(dir, 'mosquitto.log'), port, () =>
    waitFor('mosquitto', reachable),
  );
  await proc.start().catch((e) => {
    rmSync(dir, { recursive: true, force: true });
    throw e;
  });
  return {
    url: `mqtt://127.0.0.1:${port}`,
    port,
    ingester_url: `mqtt://127.0.0.1:${ingesterPort}`,
    log_file: join(dir, 'log/mosquitto.log'),
    dir,
    process: proc,
    async close() {
      await proc.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
