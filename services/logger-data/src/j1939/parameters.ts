/**
 * The standard SAE J1939-71 parameters the decoder reads without a mapping, by their published
 * definitions (J1939-71, "Vehicle Application Layer"; positions 1-based as the standard writes them,
 * multi-byte values least significant byte first): value = raw × resolution + offset.
 */
export const STANDARD_CHANNELS = [
  'coolant_spn110',
  'coolant_spn1637',
  'ambient_c',
  'speed_kmh',
  'fan_pct',
  'engine_rpm',
  'torque_pct',
  'reference_torque_nm',
] as const;
export type StandardChannel = (typeof STANDARD_CHANNELS)[number];

export interface StandardParameter {
  spn: number;
  name: string;
  pgn: number;
  /** First data byte, 1-based. */
  byte: number;
  /** Length in bytes. */
  bytes: 1 | 2;
  resolution: number;
  offset: number;
  channel: StandardChannel;
}

export const STANDARD_PARAMETERS: readonly StandardParameter[] = [
  // ET1, Engine Temperature 1: byte 1, 1 °C/bit, −40 °C.
  {
    spn: 110,
    name: 'Engine Coolant Temperature',
    pgn: 65262,
    byte: 1,
    bytes: 1,
    resolution: 1,
    offset: -40,
    channel: 'coolant_spn110',
  },
  // ET3, Engine Temperature 3: bytes 3–4, 0.03125 °C/bit, −273 °C.
  {
    spn: 1637,
    name: 'Engine Coolant Temperature (High Resolution)',
    pgn: 65129,
    byte: 3,
    bytes: 2,
    resolution: 0.03125,
    offset: -273,
    channel: 'coolant_spn1637',
  },
  // AMB, Ambient Conditions: bytes 4–5, 0.03125 °C/bit, −273 °C.
  {
    spn: 171,
    name: 'Ambient Air Temperature',
    pgn: 65269,
    byte: 4,
    bytes: 2,
    resolution: 0.03125,
    offset: -273,
    channel: 'ambient_c',
  },
  // CCVS1, Cruise Control/Vehicle Speed 1: bytes 2–3, 1/256 km/h per bit.
  {
    spn: 84,
    name: 'Wheel-Based Vehicle Speed',
    pgn: 65265,
    byte: 2,
    bytes: 2,
    resolution: 1 / 256,
    offset: 0,
    channel: 'speed_kmh',
  },
  // FD1, Fan Drive 1: byte 1, 0.4 %/bit.
  {
    spn: 975,
    name: 'Estimated Percent Fan Speed',
    pgn: 65213,
    byte: 1,
    bytes: 1,
    resolution: 0.4,
    offset: 0,
    channel: 'fan_pct',
  },
  // EEC1, Electronic Engine Controller 1: engine speed bytes 4–5 at 0.125 rpm/bit; actual torque byte 3, 1 %/bit, −125 %.
  {
    spn: 190,
    name: 'Engine Speed',
    pgn: 61444,
    byte: 4,
    bytes: 2,
    resolution: 0.125,
    offset: 0,
    channel: 'engine_rpm',
  },
  {
    spn: 513,
    name: 'Actual Engine - Percent Torque',
    pgn: 61444,
    byte: 3,
    bytes: 1,
    resolution: 1,
    offset: -125,
    channel: 'torque_pct',
  },
  // EC1, Engine Configuration 1 (longer than 8 bytes: a J1939-21 multi-packet message): bytes 20–21, 1 N·m/bit.
  {
    spn: 544,
    name: 'Engine Reference Torque',
    pgn: 65251,
    byte: 20,
    bytes: 2,
    resolution: 1,
    offset: 0,
    channel: 'reference_torque_nm',
  },
];

/** Data length of the standard single-frame messages above (J1939-71 defines each as 8 bytes). */
export const STANDARD_MESSAGE_BYTES = 8;

/** Why a raw value is not a number: 0 valid, else one of these. */
export const VALID = 0;
export const NOT_AVAILABLE = 1;
export const ERROR_VALUE = 2;

/**
 * The J1939-71 ranges of transmitted values for 1-, 2- and 4-byte parameters and 2-bit states (from
 * memory, borne out by the published maxima: 250.996 km/h = 0xFAFF / 256, 8031.875 rpm = 0xFAFF × 0.125):
 * 1 byte 0x00–0xFA valid, 0xFE error, 0xFF not available; 2 bytes up to 0xFAFF, 0xFExx error, 0xFFxx not
 * available; 4 bytes up to 0xFAFFFFFF likewise; 2 bits 00/01 valid, 10 error, 11 not available. The
 * parameter-specific indicator 0xFB and the reserved 0xFC–0xFD are no values either: counted as not
 * available. Other lengths have no such ranges.
 */
export function j1939Validity(raw: number, length: number): number {
  switch (length) {
    case 8:
      return raw <= 0xfa ? VALID : raw === 0xfe ? ERROR_VALUE : NOT_AVAILABLE;
    case 16:
      return raw <= 0xfaff ? VALID : raw >= 0xfe00 && raw <= 0xfeff ? ERROR_VALUE : NOT_AVAILABLE;
    case 32:
      return raw <= 0xfaffffff ? VALID : raw >= 0xfe000000 && raw <= 0xfeffffff ? ERROR_VALUE : NOT_AVAILABLE;
    case 2:
      return raw <= 1 ? VALID : raw === 2 ? ERROR_VALUE : NOT_AVAILABLE;
    default:
      return VALID;
  }
}
