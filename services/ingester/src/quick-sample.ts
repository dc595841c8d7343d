import {
  SIGNALS,
  SIGNAL_NAMES,
  type Sample,
  type SignalName,
  isValidId,
  parseTime,
} from '@thermargin/shared';

/** Per signal field: whether its value passes `wireSampleSchema` (same bounds, from the SIGNALS table). */
const SIGNAL_CHECKS = new Map<string, (v: unknown) => boolean>(
  SIGNAL_NAMES.map((name) => {
    const { min, max } = SIGNALS[name];
    const inRange = (v: unknown) => typeof v === 'number' && v >= min && v <= max;
    return [name, name === 'derate' ? (v) => v === 0 || v === 1 : inRange];
  }),
);
const REQUIRED = 2 + SIGNAL_NAMES.filter((n) => SIGNALS[n].required).length; // + time, vehicle

const BLANK: Record<string, unknown> = Object.fromEntries(
  ['time_ms', 'vehicle', 'trip', ...SIGNAL_NAMES].map((k) => [k, undefined]),
);

/** A sample with every field undefined: all decoded samples share this one object shape. */
export function blankSample(): Record<string, unknown> {
  return { ...BLANK };
}

/** The last trip id found valid: a batch repeats one, and the regex is a good part of the check. */
let validTrip: string | undefined;

/**
 * The fast path of decoding: the Sample of a wire sample of `vehicle` that certainly passes
 * `wireSampleSchema`, checked by hand (zod costs more per sample than JSON.parse), or undefined when
 * anything is off — the caller then asks zod, which names the broken rule. Never more lenient than
 * the schema: unknown keys, wrong types, non-finite or out-of-range values, bad ids, bad times and
 * another vehicle (valid or not) all fall through.
 */
export function quickSample(item: unknown, vehicle: string): Sample | undefined {
  if (typeof item !== 'object' || item === null || Array.isArray(item)) return undefined;
  const out = blankSample();
  let required = 0;
  // for…in over a JSON.parse object visits exactly its own keys (an inherited one only fails the check)
  for (const key in item) {
    const v = (item as Record<string, unknown>)[key];
    if (key === 'time') {
      const time_ms = parseTime(v);
      if (!Number.isFinite(time_ms)) return undefined;
      out.time_ms = time_ms;
      required++;
    } else if (key === 'vehicle') {
      if (v !== vehicle) return undefined; // the topic's id, already validated
      out.vehicle = v;
      required++;
    } else if (key === 'trip') {
      if (v !== validTrip || validTrip === undefined) {
        if (!isValidId(v)) return undefined;
        validTrip = v;
      }
      out.trip = v;
    } else {
      const check = SIGNAL_CHECKS.get(key);
      if (!check?.(v)) return undefined;
      out[key] = v;
      if (SIGNALS[key as SignalName].required) required++;
    }
  }
  return required === REQUIRED ? (out as unknown as Sample) : undefined;
}
