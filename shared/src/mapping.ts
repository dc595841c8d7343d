import { z } from 'zod';
import { idSchema } from './ids.ts';
import { SIGNAL_NAMES, type SignalName } from './telemetry.ts';

/**
 * The data mapping file: how a logger's own export or CAN frames become the project's samples. One file
 * serves tables (CSV), JSON payloads with other field names and SAE J1939 frames, so a fleet whose
 * loggers write `EngCoolTemp` in °F says so once. Everything not mapped falls back to the import
 * format's own names (a column called `ambient_c` needs no entry).
 */

/** What each signal measures, and so which units it may be given in. */
export const SIGNAL_QUANTITY = {
  speed_kmh: 'speed',
  power_kw: 'power',
  coolant_in_c: 'temperature',
  coolant_out_c: 'temperature',
  ambient_c: 'temperature',
  fan_pct: 'share',
  coolant_flow_lpm: 'flow',
  derate: 'flag',
} as const satisfies Record<SignalName, string>;
export type Quantity = (typeof SIGNAL_QUANTITY)[SignalName];

/**
 * The closed list of units per quantity; the first is the signal's own unit. The exact conversions are
 * in services/logger-data/src/units.ts. `degC`/`degF` and `m3/h` are ASCII spellings of the same units.
 */
export const UNITS = {
  temperature: ['°C', '°F', 'K', 'degC', 'degF'],
  speed: ['km/h', 'mph', 'm/s'],
  power: ['kW', 'W', 'hp'],
  flow: ['L/min', 'US gal/min', 'm³/h', 'm3/h'],
  share: ['%', 'fraction'],
  flag: ['0/1'],
} as const satisfies Record<Quantity, readonly string[]>;
export type Unit = (typeof UNITS)[Quantity][number];

/** How a time column or field is written. `local` needs `zone` (an IANA time zone such as Europe/Vienna). */
export const TIME_FORMS = ['iso8601', 'epoch_s', 'epoch_ms', 'epoch_us', 'local'] as const;
export type TimeForm = (typeof TIME_FORMS)[number];
/** Order of day, month and year in a local date written with numbers only (`01.06.2024`, `6/1/2024`). */
export const DATE_ORDERS = ['ymd', 'dmy', 'mdy'] as const;

const signalName = z.enum(SIGNAL_NAMES as [SignalName, ...SignalName[]], {
  error: (i) => `${JSON.stringify(i.input)} is not a signal (one of ${SIGNAL_NAMES.join(', ')})`,
});
const finite = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);
const unitName = z.string({ error: 'unit must be text' });

/** A unit that belongs to the signal's quantity, as a zod check on an object with `signal` and `unit`. */
function unitFitsSignal(v: { signal: SignalName; unit: string }, ctx: z.RefinementCtx): void {
  const quantity = SIGNAL_QUANTITY[v.signal];
  const allowed: readonly string[] = UNITS[quantity];
  if (!allowed.includes(v.unit))
    ctx.addIssue({
      code: 'custom',
      path: ['unit'],
      message: `${JSON.stringify(v.unit)} is not a unit of ${quantity} for ${v.signal} (one of ${allowed.join(', ')})`,
    });
}

/** A source column (CSV) or field (JSON) carrying one signal: value = (raw × scale + offset) in `unit`. */
export const fieldMapSchema = z
  .strictObject({
    signal: signalName,
    unit: unitName,
    scale: finite('scale').optional(),
    offset: finite('offset').optional(),
  })
  .superRefine(unitFitsSignal);
export type FieldMap = z.infer<typeof fieldMapSchema>;

export const timeMapSchema = z
  .strictObject({
    field: z.string().min(1),
    form: z.enum(TIME_FORMS, { error: `form must be one of ${TIME_FORMS.join(', ')}` }),
    zone: z.string().min(1).optional(),
    date_order: z.enum(DATE_ORDERS).optional(),
  })
  .superRefine((t, ctx) => {
    if (t.form === 'local' && !t.zone)
      ctx.addIssue({
        code: 'custom',
        path: ['zone'],
        message: 'local time needs an IANA zone, e.g. Europe/Vienna',
      });
    if (t.zone && !validZone(t.zone))
      ctx.addIssue({
        code: 'custom',
        path: ['zone'],
        message: `${JSON.stringify(t.zone)} is not an IANA time zone`,
      });
    if (t.zone && t.form !== 'local')
      ctx.addIssue({ code: 'custom', path: ['zone'], message: 'zone is for local times only' });
  });
export type TimeMap = z.infer<typeof timeMapSchema>;

function validZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

/** J1939 source addresses are 0–253 (254 is "null", 255 "global"). */
const sourceAddress = z.number().int().min(0).max(253);
const pgnSchema = z
  .number()
  .int()
  .min(0)
  .max(0x3ffff, 'pgn must be 0…262143 (18 bits)')
  .refine((p) => (p & 0xff00) >= 0xf000 || (p & 0xff) === 0, {
    message: 'a PDU1 pgn (PF < 240) has 0 in its low byte: the destination is not part of it',
  });

/**
 * A parameter of a CAN frame carrying one signal (radiator outlet temperature, coolant flow, electric
 * traction power, a derate flag, a proprietary PGN): bit position and length as in a DBC file (Intel:
 * start_bit is the least significant bit; Motorola: the most significant, bits numbered byte × 8 + bit
 * with bit 0 the least significant of each byte), value = raw × scale + offset in `unit`.
 */
export const frameSignalSchema = z
  .strictObject({
    signal: signalName,
    pgn: pgnSchema,
    source_address: sourceAddress.optional(),
    start_bit: z.number().int().min(0).max(511),
    length: z.number().int().min(1).max(32),
    byte_order: z.enum(['intel', 'motorola']).optional(),
    signed: z.boolean().optional(),
    scale: finite('scale'),
    offset: finite('offset').optional(),
    unit: unitName,
    /** s: the value counts as missing this long after its last frame (default `stale_s`). */
    stale_s: z.number().positive().optional(),
    /** `j1939` (default): the J1939-71 "error" and "not available" ranges of 1-, 2- and 4-byte and
     *  2-bit parameters are missing values; `none`: every raw value is a number. */
    not_available: z.enum(['j1939', 'none']).optional(),
  })
  .superRefine(unitFitsSignal);
export type FrameSignal = z.infer<typeof frameSignalSchema>;

export const framesMapSchema = z.strictObject({
  /** s, 1: samples are built at this interval by last value held. */
  interval_s: z.number().positive().max(3600).optional(),
  /** s, 5: a value older than this at a sample time is missing (per signal below). */
  stale_s: z.number().positive().max(3600).optional(),
  /** Per standard signal: take it only from this source address (e.g. 0, the first engine). */
  source_address: z.partialRecord(signalName, sourceAddress).optional(),
  /** Parameters beyond the standard ones, or replacing one (a later definition of a signal wins). */
  signals: z.array(frameSignalSchema).max(256).optional(),
});
export type FramesMap = z.infer<typeof framesMapSchema>;

export const dataMapSchema = z.strictObject({
  /** Free text: which logger, which firmware, who wrote this. */
  description: z.string().max(2000).optional(),
  /** Detected from the file when absent. */
  delimiter: z.enum([',', ';', '\t', 'tab']).optional(),
  /** Detected from the file when absent. */
  decimal: z.enum(['.', ',']).optional(),
  time: timeMapSchema.optional(),
  /** The vehicle: a column/field holding its id, or one id for the whole file. */
  vehicle: z
    .union([z.strictObject({ field: z.string().min(1) }), z.strictObject({ id: idSchema })])
    .optional(),
  trip: z.strictObject({ field: z.string().min(1) }).optional(),
  /** Source column or field name → the signal it carries. */
  fields: z.record(z.string().min(1), fieldMapSchema).optional(),
  frames: framesMapSchema.optional(),
});
export type DataMap = z.infer<typeof dataMapSchema>;
