import type { SignalName } from '@thermargin/shared';
import { SIGNAL_QUANTITY, type Unit } from '@thermargin/shared/mapping';

/**
 * A unit conversion into a signal's own unit: ((x + pre) × mul) ÷ div + post. Written this way so every
 * conversion in the closed list is exact where the arithmetic allows (212 °F gives 100 °C exactly, which
 * x × 5/9 − 160/9 does not).
 */
export interface Conversion {
  pre: number;
  mul: number;
  div: number;
  post: number;
}

const IDENTITY: Conversion = { pre: 0, mul: 1, div: 1, post: 0 };

/**
 * The exact conversions of the mapping file's units (shared/mapping.ts, UNITS), each by its definition:
 * - °F: t/°C = (t/°F − 32) / 1.8 (NIST SP 811, 2008, B.8); K: t/°C = T/K − 273.15 (SI Brochure, 9th ed.,
 *   2019, 2.3.1).
 * - mph: the international mile, 1609.344 m exactly (NIST SP 811, B.8); m/s: × 3.6.
 * - hp: mechanical horsepower, 550 ft·lbf/s = 745.699 871 582 270 22 W (NIST SP 811, B.8; the foot is
 *   0.3048 m and the pound-force 4.448 221 615 260 5 N exactly); W: ÷ 1000.
 * - US gal/min: the US liquid gallon, 231 in³ = 3.785 411 784 L exactly (NIST SP 811, B.8); m³/h: × 1000 ÷ 60.
 * - fraction: × 100 to percent.
 */
export const UNIT_CONVERSIONS: Record<Unit, Conversion> = {
  '°C': IDENTITY,
  degC: IDENTITY,
  '°F': { pre: -32, mul: 5, div: 9, post: 0 },
  degF: { pre: -32, mul: 5, div: 9, post: 0 },
  K: { pre: 0, mul: 1, div: 1, post: -273.15 },
  'km/h': IDENTITY,
  mph: { pre: 0, mul: 1.609344, div: 1, post: 0 },
  'm/s': { pre: 0, mul: 3.6, div: 1, post: 0 },
  kW: IDENTITY,
  W: { pre: 0, mul: 1, div: 1000, post: 0 },
  // 550 ft·lbf/s, the foot 0.3048 m and the pound-force 0.453 592 37 kg × 9.806 65 m/s², all exact.
  hp: { pre: 0, mul: 550 * 0.3048 * 0.45359237 * 9.80665, div: 1000, post: 0 },
  'L/min': IDENTITY,
  'US gal/min': { pre: 0, mul: 3.785411784, div: 1, post: 0 },
  'm³/h': { pre: 0, mul: 1000, div: 60, post: 0 },
  'm3/h': { pre: 0, mul: 1000, div: 60, post: 0 },
  '%': IDENTITY,
  fraction: { pre: 0, mul: 100, div: 1, post: 0 },
  '0/1': IDENTITY,
};

/** A raw value's way into a signal: raw × scale + offset gives the value in `unit`, then `to` converts. */
export interface ValueMap {
  scale: number;
  offset: number;
  to: Conversion;
}

export function valueMap(unit: Unit, scale = 1, offset = 0): ValueMap {
  return { scale, offset, to: UNIT_CONVERSIONS[unit] };
}

/** The value in the signal's own unit. */
export function mapValue(m: ValueMap, raw: number): number {
  const c = m.to;
  return ((raw * m.scale + m.offset + c.pre) * c.mul) / c.div + c.post;
}

/** Whether the map changes nothing (the import format's own columns). */
export function isIdentity(m: ValueMap): boolean {
  return m.scale === 1 && m.offset === 0 && m.to === IDENTITY;
}

/** The signal's own unit (the first of its quantity's list). */
export function ownUnit(signal: SignalName): Unit {
  return OWN[SIGNAL_QUANTITY[signal]];
}

const OWN = {
  temperature: '°C',
  speed: 'km/h',
  power: 'kW',
  flow: 'L/min',
  share: '%',
  flag: '0/1',
} as const satisfies Record<(typeof SIGNAL_QUANTITY)[SignalName], Unit>;
