import { SAMPLE_TOPIC_FILTER, isValidId, sampleTopic } from '@thermargin/shared';

/**
 * Who may do what on the broker, one rule set for both brokers (Mosquitto's ACL file is rendered from
 * it, the embedded broker calls it): a vehicle (username = its id) may only publish its own sample
 * topic and subscribe to nothing; an ingester may only subscribe (plain or shared) and publish nothing.
 */
export type BrokerRole = 'vehicle' | 'ingester';

export interface BrokerUser {
  username: string;
  password: string;
  role: BrokerRole;
}

export function canPublish(user: Pick<BrokerUser, 'username' | 'role'>, topic: string): boolean {
  return user.role === 'vehicle' && isValidId(user.username) && topic === sampleTopic(user.username);
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
  return (shared ? shared[1] : filter) === SAMPLE_TOPIC_FILTER;
}

/** The Mosquitto `acl_file` for these users (passwords go to `mosquitto_passwd`, never here). */
export function renderMosquittoAcl(users: readonly Pick<BrokerUser, 'username' | 'role'>[]): string {
  const blocks = users.map((u) => {
    if (!isValidId(u.username))
      throw new Error(`renderMosquittoAcl: ${JSON.stringify(u.username)} is not a valid id`);
    return u.role === 'ingester'
      ? `user ${u.username}\ntopic read ${SAMPLE_TOPIC_FILTER}\n`
      : `user ${u.username}\ntopic write ${sampleTopic(u.username)}\n`;
  });
  return `# Generated from services/broker/src/acl.ts; anything not granted is denied.\n\n${blocks.join('\n')}`;
}
