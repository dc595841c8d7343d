import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
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
  url: string;
  port: number;
  dir: string;
  process: ServerProcess;
  close(): Promise<void>;
}

/**
 * The shipped config/mosquitto/mosquitto.conf settings, with paths and port of the temp dir: the
 * password file is generated with `mosquitto_passwd -b` from the test users given (never a real one).
 */
export function startMosquitto(users: readonly BrokerUser[]): Promise<MosquittoServer> {
  return retryOnPortClash(() => startOnFreshPort(users));
}

async function startOnFreshPort(users: readonly BrokerUser[]): Promise<MosquittoServer> {
  const dir = mkdtempSync(join(tmpdir(), 'thermargin-mosquitto-'));
  const port = await freePort();
  const passwd = join(dir, 'passwd');
  writeFileSync(passwd, '');
  for (const u of users) execFileSync(MOSQUITTO_PASSWD, ['-b', passwd, u.username, u.password]);
  writeFileSync(join(dir, 'acl'), renderMosquittoAcl(users));
  const conf = join(dir, 'mosquitto.conf');
  // Started as root, Mosquitto switches to its own user, which cannot read this private temp dir.
  const runAsRoot = process.getuid?.() === 0;
  writeFileSync(
    conf,
    `${runAsRoot ? 'user root\n' : ''}listener ${port} 127.0.0.1
allow_anonymous false
password_file ${passwd}
acl_file ${join(dir, 'acl')}
persistence true
persistence_location ${dir}/
autosave_interval 1
max_queued_messages 0
max_inflight_messages 0
max_packet_size 16777216
log_dest stderr
log_type error
log_type warning
`,
  );
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
    dir,
    process: proc,
    async close() {
      await proc.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
