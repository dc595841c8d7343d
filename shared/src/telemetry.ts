import { z } from 'zod';
import { idSchema } from './ids.ts';

/**
 * The telemetry signals, their units (in the names) and plausible ranges. This table is the one source:
 * the wire schema below, the CSV importer and the stores' columns are all derived from it.
 * Ranges are physical plausibility limits, not operating bands: a value outside is a broken sensor or
 * a decoding fault (e.g. an SAE J1939 "error" byte 0xFE read as 214 °C), never a hot day.
 */
export const SIGNALS = {
  speed_kmh: { required: true, min: 0, max: 250, what: 'vehicle speed (SAE J1939 SPN 84 range 0–250.996)' },
  power_kw: {
    required: true,
    min: -2000,
    max: 2000,
    what: 'traction/shaft power, negative while regenerating',
  },
  coolant_in_c: { required: true, min: -50, max: 150, what: 'coolant temperature at the radiator inlet' },
  coolant_out_c: { required: false, min: -50, max: 150, what: 'coolant temperature at the radiator outlet' },
  ambient_c: { required: true, min: -60, max: 65, what: 'ambient air temperature' },
  fan_pct: { required: true, min: 0, max: 100, what: 'fan duty' },
  coolant_flow_lpm: { required: false, min: 0, max: 3000, what: 'coolant volume flow through the radiator' },
  derate: { required: false, min: 0, max: 1, what: 'controller limiting power for temperature (0/1)' },
} as const;

export type SignalName = keyof typeof SIGNALS;
export const SIGNAL_NAMES = Object.keys(SIGNALS) as SignalName[];

/** Earliest and latest timestamps accepted (epoch ms): before 2000 or more than a day ahead is a clock fault. */
export const TIME_MIN_MS = Date.UTC(2000, 0, 1);
export const FUTURE_TOLERANCE_MS = 24 * 3600 * 1000;

/** One sample as stored and analysed: time as epoch milliseconds, missing optional signals as undefined. */
export interface Sample {
  time_ms: number;
  vehicle: string;
  trip?: string | undefined;
  speed_kmh: number;
  power_kw: number;
  coolant_in_c: number;
  coolant_out_c?: number | undefined;
  ambient_c: number;
  fan_pct: number;
  coolant_flow_lpm?: number | undefined;
  derate?: number | undefined;
}

const ISO_UTC = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d{1,9})?(Z|[+-]00:?00)$/;

/** Parses `time` given as ISO 8601 UTC text or epoch milliseconds; NaN when it is neither. */
export function parseTime(value: unknown): number {
  if (typeof value === 'number') return Number.isFinite(value) ? value : Number.NaN;
  if (typeof value !== 'string') return Number.NaN;
  const s = value.trim();
  if (/^-?\d+(\.\d+)?$/.test(s)) return Number(s);
  if (!ISO_UTC.test(s)) return Number.NaN;
  return Date.parse(s);
}

function signalSchema(name: SignalName) {
  const spec = SIGNALS[name];
  return z
    .number({ error: `${name} must be a number` })
    .refine(Number.isFinite, `${name} must be finite`)
    .refine((v) => v >= spec.min && v <= spec.max, `${name} must be within ${spec.min}…${spec.max}`);
}

/** The wire form of one sample (MQTT payloads, API): exactly the contract's field names, nothing else. */
export const wireSampleSchema = z.strictObject({
  time: z.union([z.string(), z.number()]).refine((t) => Number.isFinite(parseTime(t)), {
    message: 'time must be ISO 8601 UTC or epoch milliseconds',
  }),
  vehicle: idSchema,
  trip: idSchema.optional(),
  speed_kmh: signalSchema('speed_kmh'),
  power_kw: signalSchema('power_kw'),
  coolant_in_c: signalSchema('coolant_in_c'),
  coolant_out_c: signalSchema('coolant_out_c').optional(),
  ambient_c: signalSchema('ambient_c'),
  fan_pct: signalSchema('fan_pct'),
  coolant_flow_lpm: signalSchema('coolant_flow_lpm').optional(),
  derate: z.union([z.literal(0), z.literal(1)]).optional(),
});

export type WireSample = z.infer<typeof wireSampleSchema>;

export function toSample(w: WireSample): Sample {
  const { time, ...rest } = w;
  return { time_ms: parseTime(time), ...rest };
}

export function toWire(s: Sample): WireSample {
  const { time_ms, ...rest } = s;
  const out: Record<string, unknown> = { time: new Date(time_ms).toISOString() };
  for (const [k, v] of Object.entries(rest)) if (v !== undefined) out[k] = v;
  return out as WireSample;
}

/** Why a message or sample was refused. */
export const REJECT_REASONS = [
  'json', // not parseable JSON (truncated, binary, too deep)
  'schema', // wrong shape or type, missing or unknown field
  'range', // a signal outside its plausible range (SIGNALS), or not finite
  'time_past', // before TIME_MIN_MS
  'time_future', // beyond now + FUTURE_TOLERANCE_MS
  'unknown_vehicle', // not in the fleet file
  'vehicle_mismatch', // the sample's vehicle differs from the topic's
  'topic', // not a sample topic
  'oversize', // payload over the byte limit, or too many samples in one message
  'frame_layout', // a frames payload that cannot be read (from where it breaks on: truncated, garbled)
  'dlc_mismatch', // CAN frames whose data length does not fit their PGN
  'clock_back', // CAN frames earlier than the frame before them
  'broker_login', // the broker refused the connection: wrong user name or password
  'broker_denied', // the broker refused a publish or subscribe outside the client's topics
] as const;
export type RejectReason = (typeof REJECT_REASONS)[number];

/**
 * A connection or publish a broker refused, as the tool records it: from the embedded broker's hooks
 * or read from Mosquitto's log.
 */
export interface BrokerRefusal {
  time_ms: number;
  /** '' when the broker did not name one (Mosquitto names none for a refused login). */
  client_id: string;
  /** The user name given, '' when unknown. */
  username: string;
  reason: 'broker_login' | 'broker_denied';
  topic: string;
  detail: string;
}
