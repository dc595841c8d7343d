/**
 * Reassembly of multi-packet broadcasts, the J1939-21 transport protocol's "broadcast announce message"
 * (BAM): a connection-management frame (TP.CM, PGN 60416) with control byte 32 announces the size
 * (bytes 2–3), the packet count (byte 4) and the PGN carried (bytes 6–8); then data-transfer frames
 * (TP.DT, PGN 60160) bring 7 bytes each after a sequence number 1, 2, … (byte 1). One BAM at a time per
 * source address. A packet out of sequence, a new announcement before the end, or more than T1 = 750 ms
 * between packets (the receiver's timeout, from memory) abandons the message, counted as broken.
 * Directed transfers (request-to-send and the rest) are not broadcasts and are left alone.
 */
export const TP_CM = 60416;
export const TP_DT = 60160;
const BAM = 32;
/** µs: the longest wait for the next packet of a BAM (J1939-21 T1, from memory). */
export const BAM_TIMEOUT_US = 750_000;
/** bytes: the largest message the transport protocol carries (255 packets × 7). */
const MAX_BYTES = 1785;

interface Session {
  pgn: number;
  size: number;
  packets: number;
  next: number;
  last_us: number;
  data: Uint8Array;
}

export type MessageSink = (
  time_us: number,
  pgn: number,
  source: number,
  data: Uint8Array,
  length: number,
) => void;

export class BamAssembler {
  private readonly sessions: (Session | undefined)[] = new Array(256);
  /** Messages completed, and ones abandoned (timeout, sequence break, announcement cut short, bad size). */
  completed = 0;
  broken = 0;

  constructor(private readonly deliver: MessageSink) {}

  /** A TP.CM frame's data (8 bytes at bytes[at]); returns false when it is not a BAM (left alone). */
  announce(time_us: number, source: number, bytes: Uint8Array, at: number): boolean {
    if (bytes[at] !== BAM) return false;
    if (this.sessions[source]) this.broken++;
    const size = bytes[at + 1]! | (bytes[at + 2]! << 8);
    const packets = bytes[at + 3]!;
    const pgn = bytes[at + 5]! | (bytes[at + 6]! << 8) | (bytes[at + 7]! << 16);
    if (size < 9 || size > MAX_BYTES || packets !== Math.ceil(size / 7)) {
      this.sessions[source] = undefined;
      this.broken++;
      return true;
    }
    this.sessions[source] = {
      pgn,
      size,
      packets,
      next: 1,
      last_us: time_us,
      data: new Uint8Array(packets * 7),
    };
    return true;
  }

  /** A TP.DT frame's data (8 bytes at bytes[at]). */
  packet(time_us: number, source: number, bytes: Uint8Array, at: number): void {
    const s = this.sessions[source];
    if (!s) return; // a directed transfer's packets, or a BAM whose announcement we did not see
    if (bytes[at] !== s.next || time_us - s.last_us > BAM_TIMEOUT_US) {
      this.sessions[source] = undefined;
      this.broken++;
      return;
    }
    s.data.set(bytes.subarray(at + 1, at + 8), (s.next - 1) * 7);
    s.last_us = time_us;
    if (s.next++ === s.packets) {
      this.sessions[source] = undefined;
      this.completed++;
      this.deliver(time_us, s.pgn, source, s.data, s.size);
    }
  }

  /** Sessions still open when the input ends count as broken. */
  finish(): void {
    for (let sa = 0; sa < 256; sa++)
      if (this.sessions[sa]) {
        this.sessions[sa] = undefined;
        this.broken++;
      }
  }
}
