import { isValidId } from './ids.ts';
import type { WireSample } from './telemetry.ts';

/**
 * The MQTT topic scheme. Two topics per vehicle, the vehicle id as its own level, a version level so a
 * later payload format can live beside this one:
 *
 *   thermargin/v1/vehicles/{vehicle}/samples
 *   thermargin/v1/vehicles/{vehicle}/frames
 *
 * Samples payload: UTF-8 JSON, either one wire sample (an object, see `wireSampleSchema`) or a batch (an
 * array of them, at most `MAX_SAMPLES_PER_MESSAGE`). Every sample's `vehicle` must equal the topic's.
 * Frames payload: timestamped CAN frames in the binary layout of frame-batch.ts, decoded by the
 * ingester with the vehicle's mapping. Published at QoS 1. Vehicle ids are topic-safe (see ids.ts).
 */
export const TOPIC_PREFIX = 'thermargin/v1/vehicles';
const TOPIC_SUFFIX = 'samples';
const FRAMES_SUFFIX = 'frames';

/** Filter matching every vehicle's sample topic. */
export const SAMPLE_TOPIC_FILTER = `${TOPIC_PREFIX}/+/${TOPIC_SUFFIX}`;
/** Filter matching every vehicle's frames topic. */
export const FRAME_TOPIC_FILTER = `${TOPIC_PREFIX}/+/${FRAMES_SUFFIX}`;
/** What the ingester subscribes to. */
export const INGEST_TOPIC_FILTERS = [SAMPLE_TOPIC_FILTER, FRAME_TOPIC_FILTER] as const;

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

export function frameTopic(vehicle: string): string {
  if (!isValidId(vehicle))
    throw new Error(`frameTopic: ${JSON.stringify(vehicle)} is not a valid vehicle id`);
  return `${TOPIC_PREFIX}/${vehicle}/${FRAMES_SUFFIX}`;
}

/** What a vehicle's topic names: whose messages and which kind. */
export interface VehicleTopic {
  vehicle: string;
  kind: 'samples' | 'frames';
}

/** The vehicle and kind of a vehicle's topic, or undefined when the topic is neither (or its id is not valid). */
export function parseVehicleTopic(topic: string): VehicleTopic | undefined {
  const head = `${TOPIC_PREFIX}/`;
  if (!topic.startsWith(head)) return undefined;
  const slash = topic.lastIndexOf('/');
  const kind = topic.slice(slash + 1);
  if (kind !== TOPIC_SUFFIX && kind !== FRAMES_SUFFIX) return undefined;
  const vehicle = topic.slice(head.length, slash);
  return isValidId(vehicle) ? { vehicle, kind } : undefined;
}

/** The vehicle id of a sample topic, or undefined when the topic is not one (or its id is not valid). */
export function parseSampleTopic(topic: string): string | undefined {
  const t = parseVehicleTopic(topic);
  return t?.kind === 'samples' ? t.vehicle : undefined;
}

/** `$share/{group}/{filter}`: replicas in one group split the stream (MQTT 5); the sample topics by default. */
export function sharedSampleFilter(
  group: string = DEFAULT_SHARE_GROUP,
  filter: string = SAMPLE_TOPIC_FILTER,
): string {
  if (!isValidId(group) || group.includes(':')) {
    throw new Error(`sharedSampleFilter: ${JSON.stringify(group)} is not a valid share group name`);
  }
  return `$share/${group}/${filter}`;
}

/** The payload for one sample or a batch: what publishers send on `sampleTopic(vehicle)`. */
export function encodeSamplePayload(samples: WireSample | readonly WireSample[]): string {
  return JSON.stringify(samples);
}
