import { INGEST_TOPIC_FILTERS, frameTopic, isValidId, sampleTopic } from '@thermargin/shared';

/**
 * Who may do what on the broker, one rule set for both brokers (Mosquitto's ACL file is rendered from
 * it, the embedded broker calls it): a vehicle (username = its id) may only publish its own sample and
 * frames topics and subscribe to nothing; an ingester may only subscribe to them (plain or shared) and
 * publish nothing.
 */
export type BrokerRole = 'vehicle' | 'ingester';

export interface BrokerUser {
  username: string;
  password: string;
  role: BrokerRole;
}

export function canPublish(user: Pick<BrokerUser, 'username' | 'role'>, topic: string): boolean {
  if (user.role !== 'vehicle' || !isValidId(user.username)) return false;
  return topic === sampleTopic(user.username) || topic === frameTopic(user.username);
}

/**
 * The client id a login gets: a vehicle's is its user name whatever it asked for (as Mosquitto's
 * `use_username_as_clientid` on the vehicles' listener), so a vehicle can only ever replace its own
 * session, never the ingester's or another vehicle's; an ingester keeps the ids it asks for, except a
 * vehicle's name (undefined: refused), so the ids vehicles get stay theirs alone.
 */
export function boundClientId(
  user: Pick<BrokerUser, 'username' | 'role'>,
  requested: string,
  isVehicle: (name: string) => boolean,
): string | undefined {
  if (user.role === 'vehicle') return user.username;
  return isVehicle(requested) ? undefined : requested;
}

/** `$share/{group}/{filter}` is judged by its filter (MQTT 5 shared subscriptions). */
export function canSubscribe(user: Pick<BrokerUser, 'role'>, filter: string): boolean {
  if (user.role !== 'ingester') return false;
  const shared = /^\$share\/[^/+#]+\/(.+)$/.exec(filter);
  return (INGEST_TOPIC_FILTERS as readonly string[]).includes(shared ? shared[1]! : filter);
}

/** The Mosquitto `acl_file` for these users (passwords go to `mosquitto_passwd`, never here). */
export function renderMosquittoAcl(users: readonly Pick<BrokerUser, 'username' | 'role'>[]): string {
  const blocks = users.map((u) => {
    if (!isValidId(u.username))
      throw new Error(`renderMosquittoAcl: ${JSON.stringify(u.username)} is not a valid id`);
    const lines =
      u.role === 'ingester'
        ? INGEST_TOPIC_FILTERS.map((f) => `topic read ${f}`)
        : [sampleTopic(u.username), frameTopic(u.username)].map((t) => `topic write ${t}`);
    return `user ${u.username}\n${lines.join('\n')}\n`;
  });
  return `# Generated from services/broker/src/acl.ts; anything not granted is denied.\n\n${blocks.join('\n')}`;
}
