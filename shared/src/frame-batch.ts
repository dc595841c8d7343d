/**
 * The payload of the MQTT frames topic (`thermargin/v1/vehicles/{vehicle}/frames`): timestamped CAN
 * frames as a logger captured them, in a compact binary layout (cellular links pay per byte). Layout 1,
 * little-endian throughout:
 *
 *   header, 16 bytes
 *     0  u8   layout version, 1
 *     1  u8   flags, 0 (a reader refuses any other)
 *     2  u16  identifier count I (≥ 1 when F > 0)
 *     4  u32  frame count F
 *     8  u64  base time, epoch microseconds (< 2⁵³)
 *   identifier table, I × 5 bytes
 *        u32  CAN identifier; bit 31 set: extended (29-bit, as J1939 uses), clear: standard (11-bit)
 *        u8   data length of frames with this identifier, 0…8 (another length is another entry)
 *   frames, F × (Δt + index + data)
 *        varint  Δt, µs since the previous frame (the first: since the base time), zigzag-signed so a
 *                clock that went back stays visible instead of wrapping
 *        varint  index into the identifier table
 *        bytes   the data, the entry's length
 *
 * Varints are LEB128 (7 bits a byte, low first). A frame of 8 data bytes costs 11 bytes when frames are
 * 1–16 ms apart (Δt in 2 bytes) and 12 up to 1 s apart, plus 5 bytes per distinct identifier and the
 * 16-byte header per batch — against ≈ 45 bytes as a `candump -l` line.
 */
export const FRAME_LAYOUT_VERSION = 1;
export const FRAME_HEADER_BYTES = 16;
const ID_ENTRY_BYTES = 5;
/** Bit 31 of an identifier: extended (29-bit) frame. */
export const CAN_EXTENDED = 0x8000_0000;
/** Frames per message the ingester accepts (≈ 1 MB at 11 bytes a frame). */
export const MAX_FRAMES_PER_MESSAGE = 90_000;

/** Receives each readable frame: time, identifier (with CAN_EXTENDED), data in bytes[at, at + length). */
export type FrameVisitor = (
  time_us: number,
  id: number,
  length: number,
  bytes: Uint8Array,
  at: number,
) => void;

export interface FrameBatchReport {
  /** Base time of the batch, epoch µs (NaN when the header is unreadable). */
  base_us: number;
  /** Frames in the header's count. */
  declared: number;
  /** Frames handed to the visitor. */
  read: number;
  /** Frames earlier than one before them (not visited), and the first one's index. */
  clock_back: number;
  first_clock_back: number;
  /** Why the rest of the batch could not be read (from frame `unread_from` on), or null. */
  malformed: string | null;
  unread_from: number;
}

/** A time as epoch µs read from a u64 (two u32 halves); NaN when it is beyond 2⁵³. */
function readU64(v: DataView, at: number): number {
  const lo = v.getUint32(at, true);
  const hi = v.getUint32(at + 4, true);
  return hi >= 0x20_0000 ? Number.NaN : hi * 0x1_0000_0000 + lo;
}

/**
 * Reads a frame batch, handing each frame to `visit` in order. Never throws: a broken header reads
 * nothing, a truncated or garbled frame stops the reading there (the frames before it are kept), a frame
 * earlier than the latest before it is skipped and counted. The report says which.
 */
export function readFrameBatch(payload: Uint8Array, visit: FrameVisitor): FrameBatchReport {
  const r: FrameBatchReport = {
    base_us: Number.NaN,
    declared: 0,
    read: 0,
    clock_back: 0,
    first_clock_back: -1,
    malformed: null,
    unread_from: 0,
  };
  const stop = (why: string, i: number) => {
    r.malformed = why;
    r.unread_from = i;
    return r;
  };
  if (payload.length < FRAME_HEADER_BYTES)
    return stop(`${payload.length} bytes: shorter than the ${FRAME_HEADER_BYTES}-byte header`, 0);
  const v = new DataView(payload.buffer, payload.byteOffset, payload.byteLength);
  if (payload[0] !== FRAME_LAYOUT_VERSION)
    return stop(`layout version ${payload[0]} (this reader knows ${FRAME_LAYOUT_VERSION})`, 0);
  if (payload[1] !== 0) return stop(`flags ${payload[1]} (none are defined)`, 0);
  const ids = v.getUint16(2, true);
  r.declared = v.getUint32(4, true);
  r.base_us = readU64(v, 8);
  if (Number.isNaN(r.base_us)) return stop('base time beyond 2^53 µs', 0);
  if (r.declared > MAX_FRAMES_PER_MESSAGE)
    return stop(`${r.declared} frames: over the limit of ${MAX_FRAMES_PER_MESSAGE}`, 0);
  const tableEnd = FRAME_HEADER_BYTES + ids * ID_ENTRY_BYTES;
  if (payload.length < tableEnd) return stop(`identifier table cut short (${ids} entries declared)`, 0);
  const idOf = new Uint32Array(ids);
  const lengthOf = new Uint8Array(ids);
  for (let k = 0; k < ids; k++) {
    const at = FRAME_HEADER_BYTES + k * ID_ENTRY_BYTES;
    const id = v.getUint32(at, true);
    const len = payload[at + 4]!;
    if (len > 8) return stop(`identifier entry ${k}: data length ${len} (classic CAN carries 0…8)`, 0);
    if (id & CAN_EXTENDED ? (id & 0x6000_0000) !== 0 : id > 0x7ff)
      return stop(`identifier entry ${k}: 0x${id.toString(16)} is not an 11- or 29-bit identifier`, 0);
    idOf[k] = id;
    lengthOf[k] = len;
  }
  let p = tableEnd;
  let t = r.base_us;
  let latest = Number.NEGATIVE_INFINITY;
  const end = payload.length;
  for (let i = 0; i < r.declared; i++) {
    // Δt: zigzag LEB128, at most 8 bytes (56 bits), read with arithmetic (no 32-bit overflow).
    let z = 0;
    let mul = 1;
    let b = 0x80;
    let n = 0;
    while (b & 0x80) {
      if (p >= end || n === 8)
        return stop(p >= end ? `cut short in frame ${i}` : `frame ${i}: Δt too long`, i);
      b = payload[p++]!;
      z += (b & 0x7f) * mul;
      mul *= 128;
      n++;
    }
    const dt = z % 2 === 0 ? z / 2 : -(z + 1) / 2;
    let k = 0;
    let shift = 0;
    do {
      if (p >= end || shift > 14)
        return stop(p >= end ? `cut short in frame ${i}` : `frame ${i}: bad index`, i);
      b = payload[p++]!;
      k |= (b & 0x7f) << shift;
      shift += 7;
    } while (b & 0x80);
    if (k >= ids) return stop(`frame ${i}: identifier index ${k} of a table of ${ids}`, i);
    const len = lengthOf[k]!;
    if (p + len > end) return stop(`cut short in frame ${i}`, i);
    t += dt;
    if (t < latest) {
      if (r.clock_back++ === 0) r.first_clock_back = i;
    } else {
      latest = t;
      visit(t, idOf[k]!, len, payload, p);
      r.read++;
    }
    p += len;
  }
  if (p !== end) return stop(`${end - p} bytes after the last of ${r.declared} frames`, r.declared);
  return r;
}

/** One frame to encode: time (epoch µs), identifier (with CAN_EXTENDED for 29-bit), data (≤ 8 bytes). */
export interface CanFrame {
  time_us: number;
  id: number;
  data: Uint8Array;
}

/** A frame batch in layout 1 from frames in time order (an earlier frame is encoded as it is, Δt < 0). */
export function encodeFrameBatch(frames: readonly CanFrame[]): Uint8Array {
  const keys = new Map<number, number>();
  const table: [number, number][] = [];
  const index = frames.map((f) => {
    if (f.data.length > 8) throw new RangeError(`encodeFrameBatch: ${f.data.length} data bytes (at most 8)`);
    const key = f.id * 16 + f.data.length;
    let k = keys.get(key);
    if (k === undefined) keys.set(key, (k = table.push([f.id, f.data.length]) - 1));
    return k;
  });
  if (table.length > 0xffff) throw new RangeError('encodeFrameBatch: more than 65535 distinct identifiers');
  const out = new Uint8Array(FRAME_HEADER_BYTES + table.length * ID_ENTRY_BYTES + frames.length * 22);
  const v = new DataView(out.buffer);
  const base = Math.round(frames[0]?.time_us ?? 0);
  out[0] = FRAME_LAYOUT_VERSION;
  v.setUint16(2, table.length, true);
  v.setUint32(4, frames.length, true);
  v.setUint32(8, base % 0x1_0000_0000, true);
  v.setUint32(12, Math.floor(base / 0x1_0000_0000), true);
  let p = FRAME_HEADER_BYTES;
  for (const [id, len] of table) {
    v.setUint32(p, id >>> 0, true);
    out[p + 4] = len;
    p += ID_ENTRY_BYTES;
  }
  const varint = (x: number) => {
    while (x >= 128) {
      out[p++] = (x % 128) | 0x80;
      x = Math.floor(x / 128);
    }
    out[p++] = x;
  };
  let t = base;
  frames.forEach((f, i) => {
    const dt = Math.round(f.time_us - t);
    t += dt;
    varint(dt >= 0 ? dt * 2 : -dt * 2 - 1);
    varint(index[i]!);
    out.set(f.data, p);
    p += f.data.length;
  });
  return out.subarray(0, p);
}
