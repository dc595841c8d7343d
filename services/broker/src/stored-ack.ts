import type { Aedes, AedesPublishPacket, Client, PublishPacket } from 'aedes';

/**
 * Makes the embedded broker acknowledge a vehicle's QoS ≥ 1 publish only once a receiver with a
 * persistent session (the ingester, which acknowledges after its store write is durable) has
 * acknowledged it. aedes itself answers PUBACK from memory before routing the message, so a crash or
 * a stuck ingester (full disk) would lose messages the vehicle already dropped from its buffer.
 *
 * How: the broker's `authorizePublish` hands the packet to `relay`, which publishes a copy to the
 * subscribers and resolves when a receiver's PUBACK for that copy comes back; only then does
 * `authorizePublish` let aedes answer the vehicle — with the original redirected to `VOID_TOPIC`,
 * which nobody may subscribe, so it is not delivered twice. Until a receiver has subscribed at all
 * (a fresh start), publishes wait unacknowledged. A vehicle that resends a message still in flight
 * (same client, packet id and payload) waits on the first copy instead of adding another.
 */
export const VOID_TOPIC = '$thermargin/acknowledged';

interface InFlight {
  payload: Buffer;
  done: Promise<void>;
}

export class StoredAcks {
  /** Client ids of receivers with a persistent session and a QoS ≥ 1 subscription. */
  private readonly receivers = new Set<string>();
  private ready!: Promise<void>;
  private becomeReady!: () => void;
  /** brokerCounter of each copy → resolves its vehicle's acknowledgement. */
  private readonly waiting = new Map<number, () => void>();
  /** `${client id}\0${packet id}` → the copy in flight. */
  private readonly inFlight = new Map<string, InFlight>();

  constructor(
    private readonly broker: Aedes,
    /** Whether this client may be a receiver (the ingester role). */
    isReceiver: (client: Client) => boolean,
  ) {
    this.resetReady();
    broker.on('subscribe', (subs, client) => {
      if (!isReceiver(client) || client.clean || !subs.some((s) => s.qos >= 1)) return;
      this.receivers.add(client.id);
      this.becomeReady();
    });
    // A receiver that comes back with a clean session has dropped what its old session held.
    broker.on('client', (client) => {
      if (client.clean && this.receivers.delete(client.id) && this.receivers.size === 0) this.resetReady();
    });
    broker.on('ack', (packet, _client) => {
      const p = packet as AedesPublishPacket | undefined;
      if (!p || p.brokerId !== broker.id) return;
      const resolve = this.waiting.get(p.brokerCounter);
      if (!resolve) return;
      this.waiting.delete(p.brokerCounter);
      resolve();
    });
  }

  /** Messages published but not yet acknowledged by a receiver. */
  get pending(): number {
    return this.waiting.size;
  }

  /** Resolves once a receiver has acknowledged a copy of `packet` published on behalf of `client`. */
  relay(client: Client, packet: PublishPacket): Promise<void> {
    const key = `${client.id}\0${packet.messageId}`;
    const payload = Buffer.isBuffer(packet.payload) ? packet.payload : Buffer.from(packet.payload);
    const same = this.inFlight.get(key);
    if (same?.payload.equals(payload)) return same.done;
    const done = this.ready.then(() => this.publishCopy(packet.topic, payload));
    const entry = { payload, done };
    this.inFlight.set(key, entry);
    const forget = () => {
      if (this.inFlight.get(key) === entry) this.inFlight.delete(key);
    };
    done.then(forget, forget);
    return done;
  }

  private publishCopy(topic: string, payload: Buffer): Promise<void> {
    const broker = this.broker as Aedes & { counter: number };
    // Numbered here (aedes keeps a given number), so the receiver's PUBACK can be matched to it.
    const brokerCounter = ++broker.counter;
    return new Promise<void>((resolve, reject) => {
      this.waiting.set(brokerCounter, resolve);
      const copy = { cmd: 'publish', topic, payload, qos: 1, retain: false, dup: false };
      const numbered = Object.assign(copy, { brokerId: broker.id, brokerCounter }) as PublishPacket;
      broker.publish(numbered, (e) => {
        if (!e) return;
        this.waiting.delete(brokerCounter);
        reject(e);
      });
    });
  }

  private resetReady(): void {
    this.ready = new Promise<void>((resolve) => (this.becomeReady = resolve));
  }
}
