import { timingSafeEqual } from 'node:crypto';
import { type AddressInfo, createServer } from 'node:net';
import { Aedes } from 'aedes';
import type { BrokerRefusal } from '@thermargin/shared';
import { type BrokerUser, boundClientId, canPublish, canSubscribe } from './acl.ts';
import { StoredAcks, VOID_TOPIC } from './stored-ack.ts';

export * from './acl.ts';
export type { BrokerRefusal } from '@thermargin/shared';

/**
 * The embedded broker for a zero-setup single machine: aedes with the same authentication, ACL and
 * client-id binding as the shipped Mosquitto config. aedes speaks MQTT 3.1.1 (no shared subscriptions,
 * sessions in memory): one ingester, connected with protocol 4 (see services/ingester/README.md).
 * A vehicle's QoS 1 publish is acknowledged only once the ingester has stored it (stored-ack.ts), so
 * nothing acknowledged lives only in this process's memory.
 */
export interface EmbeddedBroker {
  url: string;
  port: number;
  /** Vehicle publishes waiting for the ingester's acknowledgement. */
  readonly unacknowledged: number;
  close(): Promise<void>;
}

export interface EmbeddedBrokerOptions {
  users: readonly BrokerUser[];
  /** 0 picks a free port. */
  port?: number;
  host?: string;
  /** Told of each refusal, so the tool can count it (per client id and reason) and show it. */
  onRefused?: (r: BrokerRefusal) => void;
}

const IDENTIFIER_REJECTED = 2;
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
  const isVehicle = (name: string) => users.get(name)?.role === 'vehicle';
  const refused = (
    client_id: string,
    username: string,
    reason: BrokerRefusal['reason'],
    topic: string,
    detail: string,
  ) => options.onRefused?.({ time_ms: Date.now(), client_id, username, reason, topic, detail });
  const denied = (client: { id: string } | null, topic: string, detail: string) =>
    refused(client?.id ?? '', (client && roleOf.get(client)?.username) ?? '', 'broker_denied', topic, detail);
  const broker = new Aedes({
    authenticate(client, username, password, done) {
      const user = username === undefined ? undefined : users.get(username);
      if (!user || !samePassword(user.password, password)) {
        const detail = user ? 'wrong password' : `no user ${JSON.stringify(username ?? '')}`;
        refused(client.id, username ?? '', 'broker_login', '', detail);
        return done(authError(BAD_CREDENTIALS, 'bad user name or password'), false);
      }
      const id = boundClientId(user, client.id, isVehicle);
      if (id === undefined) {
        refused(client.id, user.username, 'broker_login', '', `client id ${client.id} is a vehicle's`);
        return done(authError(IDENTIFIER_REJECTED, `client id ${client.id} is a vehicle's`), false);
      }
      // Set before aedes registers the client (and closes any other with the same id).
      (client as { id: string }).id = id;
      roleOf.set(client, user);
      done(null, true);
    },
    authorizePublish(client, packet, done) {
      const user = client ? roleOf.get(client) : undefined;
      if (!client || !user || !canPublish(user, packet.topic)) {
        denied(client, packet.topic, 'publish outside its topics');
        return done(authError(NOT_AUTHORIZED, `publish to ${packet.topic} denied`));
      }
      if (packet.qos === 0) return done(null);
      acks.relay(client, packet).then(
        () => {
          // The copy is stored; aedes now answers the vehicle and routes the original nowhere.
          packet.topic = VOID_TOPIC;
          packet.retain = false;
          done(null);
        },
        (e: Error) => done(e),
      );
    },
    authorizeSubscribe(client, subscription, done) {
      const user = roleOf.get(client);
      if (user && canSubscribe(user, subscription.topic)) return done(null, subscription);
      denied(client, subscription.topic, 'subscribe outside its topics');
      done(authError(NOT_AUTHORIZED, `subscribe to ${subscription.topic} denied`), null);
    },
  });
  const acks = new StoredAcks(broker, (client) => roleOf.get(client)?.role === 'ingester');
  await broker.listen();
  const server = createServer(broker.handle);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `mqtt://${options.host ?? '127.0.0.1'}:${port}`,
    port,
    get unacknowledged() {
      return acks.pending;
    },
    async close() {
      await new Promise<void>((resolve) => broker.close(() => resolve()));
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
