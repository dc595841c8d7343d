/**
 * Reading an unsigned field of `length` ≤ 32 bits out of a frame's data, with the two bit layouts of
 * DBC files (the de facto CAN database format; conventions from memory, checked against the worked
 * examples in the tests): bits are numbered byte × 8 + bit, bit 0 the least significant of a byte.
 * - Intel (little-endian): `start` is the least significant bit; the value runs upward through the bytes.
 * - Motorola (big-endian): `start` is the most significant bit; the value runs down a byte, then on to the
 *   most significant bit of the next byte.
 * J1939 parameters are Intel (J1939-71: multi-byte values are sent least significant byte first).
 */
export type ByteOrder = 'intel' | 'motorola';

/** The data bytes a field occupies, as [first, last] byte indices. */
export function fieldBytes(start: number, length: number, order: ByteOrder): [number, number] {
  if (order === 'intel') return [start >> 3, (start + length - 1) >> 3];
  const msbByte = start >> 3;
  const bitsInFirst = (start & 7) + 1;
  const rest = length - bitsInFirst;
  return [msbByte, rest <= 0 ? msbByte : msbByte + Math.ceil(rest / 8)];
}

/** The raw unsigned value of the field in bytes[at …]. */
export function readBits(
  bytes: Uint8Array,
  at: number,
  start: number,
  length: number,
  order: ByteOrder,
): number {
  let v = 0;
  if (order === 'intel') {
    for (let i = length - 1; i >= 0; i--) {
      const bit = start + i;
      v = v * 2 + ((bytes[at + (bit >> 3)]! >> (bit & 7)) & 1);
    }
    return v;
  }
  let bit = start;
  for (let i = 0; i < length; i++) {
    v = v * 2 + ((bytes[at + (bit >> 3)]! >> (bit & 7)) & 1);
    bit = (bit & 7) === 0 ? bit + 15 : bit - 1;
  }
  return v;
}

/** Two's complement of an unsigned `length`-bit value. */
export function signedOf(raw: number, length: number): number {
  const half = 2 ** (length - 1);
  return raw >= half ? raw - 2 * half : raw;
}
