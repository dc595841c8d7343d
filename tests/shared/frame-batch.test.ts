import {
  CAN_EXTENDED,
  type CanFrame,
  encodeFrameBatch,
  FRAME_HEADER_BYTES,
  readFrameBatch,
} from '@thermargin/shared';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

const ET1 = (0x18feee00 | CAN_EXTENDED) >>> 0;
const EEC1 = (0x0cf00400 | CAN_EXTENDED) >>> 0;
const T = 1_717_230_000_000_000; // µs

function read(payload: Uint8Array) {
  const frames: { time_us: number; id: number; data: string }[] = [];
  const report = readFrameBatch(payload, (time_us, id, len, bytes, at) =>
    frames.push({ time_us, id, data: Buffer.from(bytes.subarray(at, at + len)).toString('hex') }),
  );
  return { frames, report };
}

const frame = (time_us: number, id: number, hex: string): CanFrame => ({
  time_us,
  id,
  data: Uint8Array.from(Buffer.from(hex, 'hex')),
});

describe('the frames topic payload, layout 1', () => {
  it('round-trips frames and costs 11 bytes a frame at bus spacing, plus 5 per identifier and a 16-byte header', () => {
    const frames = Array.from({ length: 100 }, (_, i) =>
      frame(T + i * 10_000, i % 2 ? ET1 : EEC1, '7dffffffffffff' + (i % 256).toString(16).padStart(2, '0')),
    );
    const payload = encodeFrameBatch(frames);
    // Δt 10 000 µs → zigzag 20 000 → 3 bytes; the first frame's Δt 0 → 1 byte.
    expect(payload.length).toBe(FRAME_HEADER_BYTES + 2 * 5 + 100 * (1 + 8) + 1 + 99 * 3);
    const fast = encodeFrameBatch(frames.map((f, i) => ({ ...f, time_us: T + i * 4000 })));
    expect(fast.length).toBe(FRAME_HEADER_BYTES + 2 * 5 + 100 * (1 + 8) + 1 + 99 * 2);
    const { frames: back, report } = read(payload);
    expect(report).toMatchObject({ declared: 100, read: 100, clock_back: 0, malformed: null, base_us: T });
    expect(back).toEqual(frames.map((f) => ({ ...f, data: Buffer.from(f.data).toString('hex') })));
  });

  it('keeps frames of other lengths under their own identifier entry', () => {
    const { frames } = read(encodeFrameBatch([frame(T, ET1, '78ff'), frame(T + 1, ET1, '78ffffffffffffff')]));
    expect(frames.map((f) => f.data)).toEqual(['78ff', '78ffffffffffffff']);
  });

  it('skips and counts frames whose clock went back, keeping the rest', () => {
    const p = encodeFrameBatch([frame(T, ET1, '01'), frame(T - 5, ET1, '02'), frame(T + 5, ET1, '03')]);
    const { frames, report } = read(p);
    expect(frames.map((f) => f.data)).toEqual(['01', '03']);
    expect(report).toMatchObject({ clock_back: 1, first_clock_back: 1, read: 2, malformed: null });
  });

  it('keeps the frames before a cut and says where the payload broke', () => {
    const p = encodeFrameBatch([
      frame(T, ET1, '0102'),
      frame(T + 10, ET1, '0304'),
      frame(T + 20, ET1, '0506'),
    ]);
    const { frames, report } = read(p.subarray(0, p.length - 1));
    expect(frames).toHaveLength(2);
    expect(report).toMatchObject({ malformed: 'cut short in frame 2', unread_from: 2 });
  });

  it('refuses a wrong version, flags, identifier entry or trailing bytes with the rule in words', () => {
    const p = encodeFrameBatch([frame(T, ET1, '01')]);
    const bad = (edit: (b: Uint8Array) => Uint8Array) => read(edit(Uint8Array.from(p))).report.malformed;
    const poke = (at: number, value: number) => (b: Uint8Array) => {
      b[at] = value;
      return b;
    };
    expect(bad(poke(0, 2))).toBe('layout version 2 (this reader knows 1)');
    expect(bad(poke(1, 1))).toBe('flags 1 (none are defined)');
    expect(bad(poke(FRAME_HEADER_BYTES + 4, 9))).toBe(
      'identifier entry 0: data length 9 (classic CAN carries 0…8)',
    );
    expect(bad((b) => Uint8Array.from([...b, 0]))).toBe('1 bytes after the last of 1 frames');
    expect(bad((b) => b.subarray(0, 10))).toBe('10 bytes: shorter than the 16-byte header');
  });

  it('never throws and never hands out a frame beyond the payload, whatever the bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), fc.boolean(), (tail, header) => {
        const head = header
          ? encodeFrameBatch([frame(T, ET1, '01')]).subarray(0, FRAME_HEADER_BYTES + 5)
          : new Uint8Array();
        const bytes = Uint8Array.from([...head, ...tail]);
        const r = readFrameBatch(bytes, (_t, _id, len, b, at) =>
          expect(at + len).toBeLessThanOrEqual(b.length),
        );
        expect(r.read).toBeLessThanOrEqual(r.declared);
      }),
      { numRuns: 3000 },
    );
  });
});
