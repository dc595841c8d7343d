import { CAN_EXTENDED } from '@thermargin/shared';
import { Resampler, type SampleSink } from '../resample.ts';
import { readBits, signedOf } from './bits.ts';
import type { CompiledParameter, DecoderConfig, MessageSpec } from './config.ts';
import { pgnOf } from './identifier.ts';
import { ERROR_VALUE, j1939Validity, VALID } from './parameters.ts';
import { BamAssembler, TP_CM, TP_DT } from './transport.ts';

/** What a stream of frames held, counted. */
export interface FrameCounts {
  frames: number;
  /** Frames of a PGN a parameter is read from (transport-protocol frames of a broadcast included). */
  decoded: number;
  /** Frames (or reassembled messages) of a PGN nothing reads. */
  unknown_pgn: number;
  /** Parameter values sent as "not available" (or reserved), and as "error": missing values, not numbers. */
  not_available: number;
  error_values: number;
  /** Frames whose data length does not fit their PGN (not decoded). */
  dlc_mismatch: number;
  /** 11-bit frames: not J1939, left alone. */
  standard_id: number;
  /** Multi-packet broadcasts reassembled, and ones broken off. */
  bam_completed: number;
  bam_broken: number;
  /** Samples built. */
  samples: number;
}

export function emptyFrameCounts(): FrameCounts {
  return {
    frames: 0,
    decoded: 0,
    unknown_pgn: 0,
    not_available: 0,
    error_values: 0,
    dlc_mismatch: 0,
    standard_id: 0,
    bam_completed: 0,
    bam_broken: 0,
    samples: 0,
  };
}

/** Told of each frame that could not be decoded, with the rule in words. */
export type FrameProblemSink = (reason: 'dlc_mismatch', detail: string) => void;

/**
 * SAE J1939 frames → samples: each 29-bit frame's PGN (J1939-21) picks the parameters to read, their
 * values feed the resampler's channels, and multi-packet broadcasts are reassembled first. Frames must
 * come in time order (the readers see to it). Allocation-free per frame.
 */
export class FrameDecoder {
  readonly counts = emptyFrameCounts();
  /** Frames per PGN nothing reads. */
  readonly unknownPgns = new Map<number, number>();
  private readonly resampler: Resampler;
  private readonly bam: BamAssembler;

  constructor(
    private readonly config: DecoderConfig,
    sink: SampleSink,
    private readonly problem: FrameProblemSink = () => {},
  ) {
    this.resampler = new Resampler(config, sink);
    this.bam = new BamAssembler((t, pgn, sa, data, length) =>
      this.message(t, pgn, sa, data, 0, length, true),
    );
  }

  /** One frame: time (epoch µs), identifier (CAN_EXTENDED set for 29-bit), data in bytes[at, at + length). */
  frame(time_us: number, id: number, length: number, bytes: Uint8Array, at: number): void {
    const c = this.counts;
    c.frames++;
    this.resampler.advance(time_us);
    if (!(id & CAN_EXTENDED)) {
      c.standard_id++;
      return;
    }
    const pgn = pgnOf(id & 0x1fff_ffff);
    const source = id & 0xff;
    if (pgn === TP_CM || pgn === TP_DT) {
      if (length !== 8) {
        this.mismatch(pgn, source, length, 'exactly 8');
        return;
      }
      if (pgn === TP_DT) this.bam.packet(time_us, source, bytes, at);
      else if (!this.bam.announce(time_us, source, bytes, at)) {
        c.unknown_pgn++; // a directed transfer: not ours to read
        return;
      }
      c.decoded++;
      return;
    }
    this.message(time_us, pgn, source, bytes, at, length, false);
  }

  /** Emits the last samples; call once at the end of the input. */
  finish(): void {
    this.bam.finish();
    this.resampler.finish();
    this.counts.bam_completed = this.bam.completed;
    this.counts.bam_broken = this.bam.broken;
    this.counts.samples = this.resampler.samples;
  }

  private message(
    time_us: number,
    pgn: number,
    source: number,
    bytes: Uint8Array,
    at: number,
    length: number,
    reassembled: boolean,
  ): void {
    const c = this.counts;
    const k = this.config.byPgn[pgn]!;
    if (k < 0) {
      c.unknown_pgn++;
      this.unknownPgns.set(pgn, (this.unknownPgns.get(pgn) ?? 0) + 1);
      return;
    }
    const m = this.config.messages[k]!;
    const fits = m.exact && !reassembled ? length === m.bytes : length >= m.bytes;
    if (!fits) {
      this.mismatch(pgn, source, length, m.exact ? `exactly ${m.bytes}` : `at least ${m.bytes}`);
      return;
    }
    if (!reassembled) c.decoded++;
    this.read(m, time_us, source, bytes, at);
  }

  private read(m: MessageSpec, time_us: number, source: number, bytes: Uint8Array, at: number): void {
    const c = this.counts;
    for (let i = 0; i < m.params.length; i++) {
      const p = m.params[i]!;
      if (p.source >= 0 && p.source !== source) continue;
      const raw = rawValue(p, bytes, at);
      const validity = p.j1939 ? j1939Validity(raw, p.length) : VALID;
      if (validity !== VALID) {
        if (validity === ERROR_VALUE) c.error_values++;
        else c.not_available++;
        this.resampler.set(p.channel, time_us, Number.NaN);
        continue;
      }
      const x = ((p.signed ? signedOf(raw, p.length) : raw) * p.num + p.off) / p.den + p.rest;
      const to = p.to;
      this.resampler.set(p.channel, time_us, ((x + to.pre) * to.mul) / to.div + to.post);
    }
  }

  private mismatch(pgn: number, source: number, length: number, needs: string): void {
    this.counts.dlc_mismatch++;
    this.problem(
      'dlc_mismatch',
      `PGN ${pgn} from source ${source} has ${length} data bytes; it needs ${needs}`,
    );
  }
}

/** The parameter's raw unsigned value; the byte-aligned Intel fields of the standard are read directly. */
function rawValue(p: CompiledParameter, bytes: Uint8Array, at: number): number {
  if (p.order === 'intel' && (p.start & 7) === 0) {
    const b = at + (p.start >> 3);
    if (p.length === 8) return bytes[b]!;
    if (p.length === 16) return bytes[b]! | (bytes[b + 1]! << 8);
    if (p.length === 32)
      return (bytes[b]! | (bytes[b + 1]! << 8) | (bytes[b + 2]! << 16)) + bytes[b + 3]! * 0x100_0000;
  }
  return readBits(bytes, at, p.start, p.length, p.order);
}
