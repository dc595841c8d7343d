import { timingSafeEqual } from 'node:crypto';
import { type AddressInfo, createServer } from 'node:net';
import { Aedes } from 'aedes';
import { type BrokerUser, canPublish, canSubscribe } from './acl.ts';

export * from './acl.ts';

/**
 * The embedded broker for a zero-setup single machine: aedes with the same authentication and ACL as
 * the shipped Mosquitto config. aedes speaks MQTT 3.1.1 (no shared subscriptions, sessions in memory):
 * one ingester, connected with protocol 4 (see services/ingester/README.md).
 */
export interface EmbeddedBroker {
  url: string;
  port: number;
  close(): Promise<void>;
}

export interface EmbeddedBrokerOptions {
  users: readonly BrokerUser[];
  /** 0 picks a free port. */
  port?: number;
  host?: string;
}

const NOT_AUTHORIZED = 5;
const BAD_CREDENTIALS = 4;

function authError(returnCode: number, message: string) {
  return Object.assign(new Error(message), { returnCode });
}

function samePassword(a: string, b: Buffer | undefined): boolean {
  const expected = Buffer.from(a);
  return b !== undefined && b.length === expected.length && timingSafeEqual(expected, b);
}

export async function startEmbeddedBroker(options: EmbeddedBrokerOptions): Promise<EmbeddedBroker> {
  const users = new Map(options.users.map((u) => [u.username, u]));
  const roleOf = new WeakMap<object, BrokerUser>();
  const broker = await Aedes.createBroker({
    authenticate(client, username, password, done) {
      const user = username === undefined ? undefined : users.get(username);
      if (!user || !samePassword(user.password, password)) {
        return done(authError(BAD_CREDENTIALS, 'bad user name or password'), false);
      }
      roleOf.set(client, user);
      done(null, true);
    },
    authorizePublish(client, packet, done) {
      const user = client ? roleOf.get(client) : undefined;
      done(
        user && canPublish(user, packet.topic)
          ? null
          : authError(NOT_AUTHORIZED, `publish to ${packet.topic} denied`),
      );
    },
    authorizeSubscribe(client, subscription, done) {
      const user = roleOf.get(client);
      if (user && canSubscribe(user, subscription.topic)) return done(null, subscription);
      done(authError(NOT_AUTHORIZED, `subscribe to ${subscription.topic} denied`), null);
    },
  });
  const server = createServer(broker.handle);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `mqtt://${options.host ?? '127.0.0.1'}:${port}`,
    port,
    async close() {
      await new Promise<void>((resolve) => broker.close(() => resolve()));
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
