import {
  encodeFrameBatch,
  encodeSamplePayload,
  frameTopic,
  MAX_SAMPLES_PER_MESSAGE,
  type Sample,
  sampleTopic,
  toWire,
} from '@thermargin/shared';
import mqtt, { type MqttClient } from 'mqtt';
import { sendsEngineFrames, vehicleFrames } from './frames.ts';
import type { Scenario, TimeRange } from './scenario.ts';

export interface PublishOptions {
  /** samples, 1000: per message (a JSON array); at most the ingester's MAX_SAMPLES_PER_MESSAGE. */
  batch_size: number;
  /** ms wall time, 1000: a partial batch older than this is sent anyway (matters for paced live streams). */
  flush_ms: number;
  /** messages, 16: unacknowledged QoS 1 publishes allowed before waiting for acks. */
  max_in_flight: number;
  /** What to send; default: the scenario's history, merged in time order. */
  samples?: Iterable<Sample> | AsyncIterable<Sample>;
  range?: TimeRange;
  /** Per-vehicle broker log-in (the broker's ACL lets a vehicle publish only its own topic): each vehicle
   *  then gets its own connection to `url`, and `client` serves only vehicles this returns undefined for. */
  credentials?: (vehicle: string) => { username: string; password: string } | undefined;
  url?: string;
  /** Vehicles whose loggers send SAE J1939 frames (frames topic, frame-batch layout) instead of samples;
   *  each message carries the frames of its samples, so the ingester rebuilds exactly them. */
  frames?: ReadonlySet<string>;
  /** Wall clock for flush_ms (injected). */
  now: () => number;
}

export const PUBLISH_DEFAULTS = Object.freeze({
  batch_size: 1000,
  flush_ms: 1000,
  max_in_flight: 16,
  now: () => Date.now(),
});

/** What the broker acknowledged. */
export interface PublishResult {
  samples: number;
  messages: number;
}

/**
 * Publishes a scenario's samples to the broker on `sampleTopic(vehicle)` (shared/topics.ts), QoS 1,
 * in batches per vehicle. Resolves once every message is acknowledged; per-vehicle connections it opened
 * are closed again, `client` is left open for the caller.
 */
export async function publishScenario(
  client: MqttClient | null,
  scenario: Scenario,
  options: Partial<PublishOptions> = {},
): Promise<PublishResult> {
  const o = { ...PUBLISH_DEFAULTS, ...options };
  if (!(Number.isInteger(o.batch_size) && o.batch_size >= 1 && o.batch_size <= MAX_SAMPLES_PER_MESSAGE))
    throw new RangeError(
      `publishScenario: batch_size must be an integer 1…${MAX_SAMPLES_PER_MESSAGE}, got ${o.batch_size}`,
    );
  if (o.credentials && !o.url) throw new RangeError('publishScenario: credentials need the broker url');
  const own = new Map<string, Promise<MqttClient>>();
  const clientFor = (vehicle: string): Promise<MqttClient> => {
    const login = o.credentials?.(vehicle);
    if (!login) {
      if (!client)
        throw new RangeError(`publishScenario: no client and no credentials for vehicle ${vehicle}`);
      return Promise.resolve(client);
    }
    let c = own.get(vehicle);
    if (!c) {
      c = mqtt.connectAsync(o.url!, { ...login, clientId: vehicle, reconnectPeriod: 1000 });
      own.set(vehicle, c);
    }
    return c;
  };

  const buffers = new Map<string, { samples: Sample[]; since_ms: number }>();
  const inFlight = new Set<Promise<void>>();
  let failure: unknown = null;
  const result: PublishResult = { samples: 0, messages: 0 };
  const engine = new Map(scenario.fleet.vehicles.map((v) => [v.id, sendsEngineFrames(v)]));
  const message = (vehicle: string, batch: Sample[]): [string, string | Buffer] =>
    o.frames?.has(vehicle)
      ? [
          frameTopic(vehicle),
          Buffer.from(encodeFrameBatch([...vehicleFrames(batch, engine.get(vehicle) ?? false)])),
        ]
      : [sampleTopic(vehicle), encodeSamplePayload(batch.map(toWire))];
  const send = async (vehicle: string, batch: Sample[]): Promise<void> => {
    if (failure) throw failure;
    const c = await clientFor(vehicle);
    const p = c
      .publishAsync(...message(vehicle, batch), { qos: 1 })
      .then(() => {
        result.messages++;
        result.samples += batch.length;
      })
      .catch((e: unknown) => {
        failure ??= e; // kept, rethrown by the next send or at the end: nothing is lost silently
      })
      .finally(() => inFlight.delete(p));
    inFlight.add(p);
    if (inFlight.size >= o.max_in_flight) await Promise.race(inFlight);
  };
  const flushOld = async (): Promise<void> => {
    const now = o.now();
    for (const [vehicle, b] of buffers)
      if (b.samples.length && now - b.since_ms >= o.flush_ms) {
        buffers.delete(vehicle);
        await send(vehicle, b.samples);
      }
  };

  let seen = 0;
  try {
    for await (const s of o.samples ?? scenario.fleetSamples(o.range)) {
      seen++;
      let b = buffers.get(s.vehicle);
      if (!b) buffers.set(s.vehicle, (b = { samples: [], since_ms: o.now() }));
      b.samples.push(s);
      if (b.samples.length >= o.batch_size) {
        buffers.delete(s.vehicle);
        await send(s.vehicle, b.samples);
      } else if (seen % 256 === 0) await flushOld();
    }
    for (const [vehicle, b] of buffers) await send(vehicle, b.samples);
    await Promise.all(inFlight);
    if (failure) throw failure;
  } finally {
    await Promise.all([...own.values()].map(async (c) => (await c).endAsync()));
  }
  return result;
}
