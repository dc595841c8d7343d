import { isValidId } from './ids.ts';
import type { WireSample } from './telemetry.ts';

/**
 * The MQTT topic scheme. One topic per vehicle, the vehicle id as its own level, a version level so a
 * later payload format can live beside this one:
 *
 *   thermargin/v1/vehicles/{vehicle}/samples
 *
 * Payload: UTF-8 JSON, either one wire sample (an object, see `wireSampleSchema`) or a batch (an array
 * of them, at most `MAX_SAMPLES_PER_MESSAGE`). Every sample's `vehicle` must equal the topic's.
 * Published at QoS 1. Vehicle ids are topic-safe by construction (see ids.ts).
 */
export const TOPIC_PREFIX = 'thermargin/v1/vehicles';
const TOPIC_SUFFIX = 'samples';

/** Filter matching every vehicle's sample topic. */
export const SAMPLE_TOPIC_FILTER = `${TOPIC_PREFIX}/+/${TOPIC_SUFFIX}`;

/** Default MQTT 5 shared-subscription group the ingester replicas join. */
export const DEFAULT_SHARE_GROUP = 'ingesters';

/** Samples per message the ingester accepts; a larger batch is rejected whole as oversize. */
export const MAX_SAMPLES_PER_MESSAGE = 10_000;

/** bytes: payload size the ingester accepts by default (its INGEST_MAX_PAYLOAD_BYTES). */
export const DEFAULT_MAX_PAYLOAD_BYTES = 1024 * 1024;

export function sampleTopic(vehicle: string): string {
  if (!isValidId(vehicle))
    throw new Error(`sampleTopic: ${JSON.stringify(vehicle)} is not a valid vehicle id`);
  return `${TOPIC_PREFIX}/${vehicle}/${TOPIC_SUFFIX}`;
}

/** The vehicle id of a sample topic, or undefined when the topic is not one (or its id is not valid). */
export function parseSampleTopic(topic: string): string | undefined {
  const head = `${TOPIC_PREFIX}/`;
  const tail = `/${TOPIC_SUFFIX}`;
  if (!topic.startsWith(head) || !topic.endsWith(tail)) return undefined;
  const vehicle = topic.slice(head.length, topic.length - tail.length);
  return isValidId(vehicle) ? vehicle : undefined;
}

/** `$share/{group}/thermargin/v1/vehicles/+/samples`: replicas in one group split the stream (MQTT 5). */
export function sharedSampleFilter(group: string = DEFAULT_SHARE_GROUP): string {
  if (!isValidId(group) || group.includes(':')) {
    throw new Error(`sharedSampleFilter: ${JSON.stringify(group)} is not a valid share group name`);
  }
  return `$share/${group}/${SAMPLE_TOPIC_FILTER}`;
}

/** The payload for one sample or a batch: what publishers send on `sampleTopic(vehicle)`. */
export function encodeSamplePayload(samples: WireSample | readonly WireSample[]): string {
  return JSON.stringify(samples);
}
