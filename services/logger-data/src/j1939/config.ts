import type { FramesMap, Problem, SignalName } from '@thermargin/shared';
import { UNIT_CONVERSIONS, type Conversion } from '../units.ts';
import { type ByteOrder, fieldBytes } from './bits.ts';
import {
  STANDARD_CHANNELS,
  STANDARD_MESSAGE_BYTES,
  STANDARD_PARAMETERS,
  type StandardChannel,
} from './parameters.ts';

/** Frame decoding defaults, defined once. */
export const FRAME_DEFAULTS = {
  /** s, 1: samples are built at this interval. */
  interval_s: 1,
  /** s, 5 (our choice: five periods of the 1 s parameters): a value this old is missing. */
  stale_s: 5,
} as const;

/** One parameter compiled for the decoder: where it sits, how it scales, which channel it feeds. */
export interface CompiledParameter {
  label: string;
  channel: number;
  /** Only frames from this source address (−1: any). */
  source: number;
  start: number;
  length: number;
  order: ByteOrder;
  signed: boolean;
  /**
   * Scale and offset as fractions over one denominator: (raw × num + off) ÷ den + rest is then one
   * correctly rounded division (0.4 as 4/10 gives 80 for 200, not 80.00000000000001; 0.1 kW with −3000 gives
   * 21.9, not 21.90000000000009), so a value reads the same as the decimal a logger would have printed.
   * `rest` is what of the offset is not a whole multiple of 1/den (0 for decimal offsets).
   */
  num: number;
  den: number;
  off: number;
  rest: number;
  to: Conversion;
  j1939: boolean;
}

/** Whole multiple of x: n with |x·d − n| tiny, or NaN. */
const whole = (x: number, d: number) => {
  const n = Math.round(x * d);
  return Math.abs(n - x * d) <= 1e-9 * Math.max(1, Math.abs(n)) ? n : Number.NaN;
};

/** Scale and offset over a power of ten up to 10⁹ (0.4 and −3000 → 4/10 and −30000/10); see CompiledParameter. */
export function decimalFraction(
  scale: number,
  offset: number,
): { num: number; den: number; off: number; rest: number } {
  for (let den = 1; den <= 1e9; den *= 10) {
    const num = whole(scale, den);
    if (Number.isNaN(num)) continue;
    const off = whole(offset, den);
    return Number.isNaN(off) ? { num, den, off: 0, rest: offset } : { num, den, off, rest: 0 };
  }
  return { num: scale, den: 1, off: 0, rest: offset };
}

/** The parameters of one PGN and the data length its frames must have. */
export interface MessageSpec {
  pgn: number;
  params: CompiledParameter[];
  /** bytes: exactly this many in a single frame when `exact`, at least this many otherwise. */
  bytes: number;
  exact: boolean;
}

/** How a sample's signal is formed from the channels: the first fresh one, or engine power. */
export interface SignalSource {
  signal: SignalName;
  channels: number[];
  /** power from engine speed × actual torque × reference torque (SPN 190, 513, 544). */
  engine_power: boolean;
}

export interface DecoderConfig {
  interval_us: number;
  /** Per channel: name and staleness, µs (Infinity: held for good, e.g. the reference torque). */
  channels: { name: string; stale_us: number }[];
  /** PGN → index in `messages`, −1 when nothing reads it. */
  byPgn: Int16Array;
  messages: MessageSpec[];
  signals: SignalSource[];
  /** N·m: reference torque to use until the bus sends its own (the fleet file's), or null. */
  reference_torque_nm: number | null;
}

const IDENTITY = UNIT_CONVERSIONS['°C'];

/** The standard parameters feeding each signal, so a mapping's `source_address` can pin them. */
const STANDARD_FEEDS: Partial<Record<SignalName, readonly StandardChannel[]>> = {
  coolant_in_c: ['coolant_spn1637', 'coolant_spn110'],
  ambient_c: ['ambient_c'],
  speed_kmh: ['speed_kmh'],
  fan_pct: ['fan_pct'],
  power_kw: ['engine_rpm', 'torque_pct', 'reference_torque_nm'],
};

/** The standard PGNs and the signal each feeds (for a mapping's draft). */
export function standardPgns(): Map<number, { signal: SignalName; name: string }> {
  const out = new Map<number, { signal: SignalName; name: string }>();
  for (const [signal, feeds] of Object.entries(STANDARD_FEEDS) as [SignalName, StandardChannel[]][])
    for (const p of STANDARD_PARAMETERS)
      if (feeds.includes(p.channel)) out.set(p.pgn, { signal, name: p.name });
  return out;
}

/**
 * The decoder's tables for a mapping's `frames` section (or none: the standard parameters only), with
 * the fleet file's reference torque. Problems name the mapping field (`frames.signals[2].start_bit`).
 */
export function compileFrames(
  frames: FramesMap | undefined,
  reference_torque_nm: number | null = null,
  where = 'frames',
): { config: DecoderConfig; problems: Problem[] } {
  const problems: Problem[] = [];
  const stale_us = (frames?.stale_s ?? FRAME_DEFAULTS.stale_s) * 1e6;
  const channels: DecoderConfig['channels'] = STANDARD_CHANNELS.map((name) => ({
    name,
    stale_us: name === 'reference_torque_nm' ? Number.POSITIVE_INFINITY : stale_us,
  }));
  const custom = new Map<SignalName, number>();
  const messages = new Map<number, MessageSpec>();
  const message = (pgn: number, bytes: number, exact: boolean): MessageSpec => {
    let m = messages.get(pgn);
    if (!m) messages.set(pgn, (m = { pgn, params: [], bytes, exact }));
    m.bytes = Math.max(m.bytes, bytes);
    m.exact ||= exact;
    return m;
  };

  (frames?.signals ?? []).forEach((s, i) => {
    const order = s.byte_order ?? 'intel';
    const [first, last] = fieldBytes(s.start_bit, s.length, order);
    const at = `${where}.signals[${i}]`;
    if (first < 0 || last >= 64) {
      problems.push({
        where: `${at}.start_bit`,
        rule: `the field runs outside 64 data bytes (bytes ${first}…${last})`,
      });
      return;
    }
    const channel =
      channels.push({
        name: `${s.signal} (pgn ${s.pgn})`,
        stale_us: (s.stale_s ?? frames!.stale_s ?? FRAME_DEFAULTS.stale_s) * 1e6,
      }) - 1;
    custom.set(s.signal, channel); // a later definition of the same signal wins
    message(s.pgn, last + 1, false).params.push({
      label: `${s.signal} from pgn ${s.pgn}`,
      channel,
      source: s.source_address ?? -1,
      start: s.start_bit,
      length: s.length,
      order,
      signed: s.signed ?? false,
      ...decimalFraction(s.scale, s.offset ?? 0),
      to: UNIT_CONVERSIONS[s.unit as keyof typeof UNIT_CONVERSIONS],
      j1939: (s.not_available ?? 'j1939') === 'j1939',
    });
  });

  const pinned = frames?.source_address ?? {};
  for (const [signal, feeds] of Object.entries(STANDARD_FEEDS) as [SignalName, StandardChannel[]][]) {
    if (custom.has(signal)) continue;
    for (const p of STANDARD_PARAMETERS) {
      if (!feeds.includes(p.channel)) continue;
      // EC1 travels by the transport protocol: its length is the announced one, at least up to SPN 544.
      const single = p.byte + p.bytes - 1 <= STANDARD_MESSAGE_BYTES;
      message(p.pgn, single ? STANDARD_MESSAGE_BYTES : p.byte + p.bytes - 1, single).params.push({
        label: `SPN ${p.spn} ${p.name}`,
        channel: STANDARD_CHANNELS.indexOf(p.channel),
        source: pinned[signal] ?? -1,
        start: (p.byte - 1) * 8,
        length: p.bytes * 8,
        order: 'intel',
        signed: false,
        ...decimalFraction(p.resolution, p.offset),
        to: IDENTITY,
        j1939: true,
      });
    }
  }

  const ch = (c: StandardChannel) => STANDARD_CHANNELS.indexOf(c);
  const signals: SignalSource[] = [];
  const own = (signal: SignalName, standard: number[], engine_power = false) => {
    const c = custom.get(signal);
    if (c !== undefined) signals.push({ signal, channels: [c], engine_power: false });
    else if (standard.length || engine_power) signals.push({ signal, channels: standard, engine_power });
  };
  own('speed_kmh', [ch('speed_kmh')]);
  own('power_kw', [], true);
  own('coolant_in_c', [ch('coolant_spn1637'), ch('coolant_spn110')]);
  own('coolant_out_c', []);
  own('ambient_c', [ch('ambient_c')]);
  own('fan_pct', [ch('fan_pct')]);
  own('coolant_flow_lpm', []);
  own('derate', []);

  const byPgn = new Int16Array(1 << 18).fill(-1);
  const list = [...messages.values()];
  for (const [i, m] of list.entries()) byPgn[m.pgn] = i;
  return {
    config: {
      interval_us: (frames?.interval_s ?? FRAME_DEFAULTS.interval_s) * 1e6,
      channels,
      byPgn,
      messages: list,
      signals,
      reference_torque_nm,
    },
    problems,
  };
}

/**
 * compileFrames remembered per frames section and reference torque: readers of many vehicles or files
 * build each decoder table (½ MB) once and share it. A section with problems is not kept (its caller
 * refuses it).
 */
export function frameTables(): (
  frames: FramesMap | undefined,
  reference_torque_nm: number | null,
) => { config: DecoderConfig; problems: Problem[] } {
  const tables = new Map<string, DecoderConfig>();
  return (frames, reference_torque_nm) => {
    const key = `${JSON.stringify(frames ?? null)}|${reference_torque_nm}`;
    const config = tables.get(key);
    if (config) return { config, problems: [] };
    const r = compileFrames(frames, reference_torque_nm);
    if (!r.problems.length) tables.set(key, r.config);
    return r;
  };
}
