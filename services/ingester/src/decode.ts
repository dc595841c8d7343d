import {
  bytesText,
  FUTURE_TOLERANCE_MS,
  MAX_SAMPLES_PER_MESSAGE,
  type RejectReason,
  SIGNALS,
  type Sample,
  TIME_MIN_MS,
  type VehicleTopic,
  type WireSample,
  formatPath,
  parseVehicleTopic,
  toSample,
  wireSampleSchema,
} from '@thermargin/shared';
import { type DeadLetter, excerpt, type FrameTally } from '@thermargin/store';
import type { z } from 'zod';
import { decodeFrames } from './decode-frames.ts';
import { quickSample } from './quick-sample.ts';
import { STANDARD_READING, type VehicleReading } from './vehicle-readings.ts';

export interface DecodeContext {
  /** Vehicle ids of the fleet file. */
  known_vehicles: ReadonlySet<string>;
  /** ms: receive time (also the reference for the future/past clock checks). */
  now_ms: number;
  max_payload_bytes: number;
  /** Per vehicle with a mapping or a reference torque in the fleet file: how its messages read. */
  readings?: ReadonlyMap<string, VehicleReading>;
}

export interface Decoded {
  samples: Sample[];
  /**
   * At most one dead letter per message: the whole message refused, or, for refused samples (or
   * frames) of it, how many and why, with the first few named.
   */
  rejects: DeadLetter[];
  /** What was refused, by reason: each refused sample or frame, or 1 for a message refused whole (metrics). */
  refused: Partial<Record<RejectReason, number>>;
  /** What each frames message held (none for sample messages). */
  tallies: FrameTally[];
}

/** Refused samples of one message named in its dead letter (the rest are counted). */
export const NAMED_REFUSALS = 3;

/**
 * One MQTT message → the samples to store and the dead letters, never a throw: a payload is refused
 * whole when its topic, vehicle, size or JSON is wrong, and sample by sample otherwise (the good ones
 * of a batch are kept). A frames message is decoded by decodeFrames. `parsed` is the topic read
 * already, when the caller has read it.
 */
export function decodeMessage(
  topic: string,
  payload: Buffer,
  ctx: DecodeContext,
  parsed: VehicleTopic | undefined = parseVehicleTopic(topic),
): Decoded {
  const vehicle = parsed?.vehicle;
  const letter = (
    reason: RejectReason,
    detail: string,
    text: () => string,
    v = vehicle ?? '',
  ): DeadLetter => ({
    received_ms: ctx.now_ms,
    vehicle: v,
    reason,
    detail,
    topic: excerpt(topic, 256),
    excerpt: excerpt(text()),
    payload_bytes: payload.length,
  });
  const whole = (reason: RejectReason, detail: string, v?: string): Decoded => ({
    samples: [],
    rejects: [letter(reason, detail, () => payload.subarray(0, 4096).toString('utf8'), v)],
    refused: { [reason]: 1 },
    tallies: [],
  });

  if (vehicle === undefined)
    return whole('topic', 'not a vehicle topic (thermargin/v1/vehicles/{vehicle}/samples or …/frames)', '');
  if (!ctx.known_vehicles.has(vehicle))
    return whole('unknown_vehicle', `vehicle ${vehicle} is not in the fleet file`);
  if (payload.length > ctx.max_payload_bytes) {
    return whole(
      'oversize',
      `payload of ${bytesText(payload.length)} is over the limit of ${bytesText(ctx.max_payload_bytes)}`,
    );
  }
  const reading = ctx.readings?.get(vehicle) ?? STANDARD_READING;
  if (parsed!.kind === 'frames')
    return decodeFrames(vehicle, payload, reading, ctx.now_ms, (reason, detail, text) =>
      letter(reason, detail, () => text),
    );
  let body: unknown;
  try {
    body = JSON.parse(payload.toString('utf8'));
  } catch (e) {
    return whole('json', `not JSON: ${(e as Error).message}`);
  }
  const isBatch = Array.isArray(body);
  if (!isBatch && (typeof body !== 'object' || body === null)) {
    return whole('schema', 'payload must be one sample (an object) or a batch (an array of samples)');
  }
  const items: unknown[] = isBatch ? (body as unknown[]) : [body];
  if (items.length === 0) return whole('schema', 'empty batch');
  if (items.length > MAX_SAMPLES_PER_MESSAGE) {
    return whole(
      'oversize',
      `batch of ${items.length} samples is over the limit of ${MAX_SAMPLES_PER_MESSAGE}`,
    );
  }

  const out: Decoded = { samples: [], rejects: [], refused: {}, tallies: [] };
  const named: { where: string; detail: string; item: unknown }[] = [];
  let first: RejectReason | undefined;
  items.forEach((raw, i) => {
    const item = reading.record ? reading.record(raw, vehicle) : raw;
    const verdict = judgeSample(item, vehicle, ctx.now_ms);
    if (!('reason' in verdict)) {
      out.samples.push(verdict);
      return;
    }
    first ??= verdict.reason;
    out.refused[verdict.reason] = (out.refused[verdict.reason] ?? 0) + 1;
    if (named.length < NAMED_REFUSALS)
      named.push({ where: isBatch ? `samples[${i}]` : 'sample', detail: verdict.detail, item: raw });
  });
  if (first === undefined) return out;
  // One letter for the message (10 000 bad items made 10 000 rows): its most frequent reason.
  const counts = Object.entries(out.refused) as [RejectReason, number][];
  const reason = counts.reduce((a, b) => (b[1] > a[1] ? b : a), [first, out.refused[first]!])[0];
  const bad = counts.reduce((n, [, c]) => n + c, 0);
  const list = named.map((n) => `${n.where}: ${n.detail}`).join('; ');
  const detail = !isBatch
    ? list
    : `${bad} of ${items.length} samples refused (${counts.map(([r, c]) => `${r} ${c}`).join(', ')}); ` +
      `${bad > named.length ? `first ${named.length}: ` : ''}${list}`;
  out.rejects.push(
    letter(reason, detail, () =>
      safeStringify(named.length === 1 ? named[0]!.item : named.map((n) => n.item)),
    ),
  );
  return out;
}

/** decodeMessage, with a last guard: an unforeseen throw dead-letters the message instead of stopping us. */
export function safeDecode(
  topic: string,
  payload: Buffer,
  ctx: DecodeContext,
  parsed: VehicleTopic | undefined = parseVehicleTopic(topic),
): Decoded {
  try {
    return decodeMessage(topic, payload, ctx, parsed);
  } catch (e) {
    const letter = {
      received_ms: ctx.now_ms,
      vehicle: parsed?.vehicle ?? '',
      reason: 'schema' as const,
      detail: `could not be decoded: ${(e as Error).message}`,
      topic: excerpt(topic, 256),
      excerpt: excerpt(payload.subarray(0, 4096).toString('utf8')),
      payload_bytes: payload.length,
    };
    return { samples: [], rejects: [letter], refused: { schema: 1 }, tallies: [] };
  }
}

/** One sample of `vehicle`'s topic: the sample to store, or why not. */
function judgeSample(
  item: unknown,
  vehicle: string,
  now_ms: number,
): Sample | { reason: RejectReason; detail: string } {
  let s = quickSample(item, vehicle);
  if (s === undefined) {
    const r = wireSampleSchema.safeParse(item);
    if (!r.success) return { reason: issueReason(r.error.issues[0], item), detail: issueText(r.error) };
    s = toSample(r.data);
  }
  if (s.vehicle !== vehicle)
    return { reason: 'vehicle_mismatch', detail: `vehicle ${s.vehicle} on ${vehicle}'s topic` };
  const time = (item as WireSample).time;
  if (s.time_ms < TIME_MIN_MS) return { reason: 'time_past', detail: `time ${time} is before 2000-01-01` };
  if (s.time_ms > now_ms + FUTURE_TOLERANCE_MS) {
    return { reason: 'time_future', detail: `time ${time} is more than a day after the receive time` };
  }
  return s;
}

/**
 * A signal that is a number outside its range or not finite (1e400 parses to Infinity) is a 'range'
 * rejection; any other broken rule is a 'schema' one.
 */
function issueReason(issue: z.core.$ZodIssue | undefined, item: unknown): RejectReason {
  const field = issue?.path[0];
  if (typeof field !== 'string' || !(field in SIGNALS) || issue?.path.length !== 1) return 'schema';
  const v = (item as Record<string, unknown>)[field];
  const spec = SIGNALS[field as keyof typeof SIGNALS];
  return typeof v === 'number' && !(v >= spec.min && v <= spec.max) ? 'range' : 'schema';
}

function issueText(error: z.ZodError): string {
  return error.issues
    .slice(0, 3)
    .map((i) => `${formatPath(i.path)}: ${i.message}`)
    .join('; ');
}

/** The item as text for the excerpt; a structure too deep to serialise is named, not shown. */
function safeStringify(item: unknown): string {
  try {
    return JSON.stringify(item) ?? typeof item;
  } catch (e) {
    return `(${typeof item} not serialisable: ${(e as Error).message})`;
  }
}
