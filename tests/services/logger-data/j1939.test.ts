import { readBits, signedOf } from '@thermargin/logger-data/j1939/bits';
import { j1939Id, parseJ1939Id } from '@thermargin/logger-data/j1939/identifier';
import { j1939Validity } from '@thermargin/logger-data/j1939/parameters';
import { describe, expect, it } from 'vitest';
import { bytesOf, decode } from './frames.ts';

const T0 = 1_717_230_000; // s, 2024-06-01T08:20:00Z

describe('29-bit identifiers: priority, PGN by the PDU1/PDU2 rule, source (SAE J1939-21)', () => {
  it('reads PDU2 broadcasts: the PDU-specific byte is the group extension, part of the PGN', () => {
    // 18FEEE00: priority 6, PF 0xFE ≥ 240, PS 0xEE → PGN 0xFEEE = 65262 (ET1), source 0.
    expect(parseJ1939Id(0x18feee00)).toEqual({
      priority: 6,
      pgn: 65262,
      source: 0,
      destination: 255,
      pdu1: false,
    });
    // 0CF00400: priority 3, PGN 0xF004 = 61444 (EEC1), source 0.
    expect(parseJ1939Id(0x0cf00400)).toMatchObject({ priority: 3, pgn: 61444, source: 0, pdu1: false });
  });
  it('reads PDU1 messages: the PDU-specific byte is the destination, and the PGN ends in 00', () => {
    // 18EA0017: request (PF 0xEA < 240) to address 0 from 0x17 → PGN 0xEA00 = 59904.
    expect(parseJ1939Id(0x18ea0017)).toEqual({
      priority: 6,
      pgn: 59904,
      source: 0x17,
      destination: 0,
      pdu1: true,
    });
    // 1CECFF00: TP.CM (PGN 60416) to global, priority 7.
    expect(parseJ1939Id(0x1cecff00)).toMatchObject({ priority: 7, pgn: 60416, destination: 255, pdu1: true });
  });
  it('counts the data page bits into the PGN (DP = 1 adds 65536)', () => {
    expect(parseJ1939Id(0x19feee00).pgn).toBe(65262 + 65536);
  });
  it('builds identifiers back from their parts', () => {
    for (const id of [0x18feee00, 0x0cf00400, 0x18ea0017, 0x1cecff00, 0x19fef1fe])
      expect(
        j1939Id(...(Object.values(parseJ1939Id(id)).slice(0, 4) as [number, number, number, number])),
      ).toBe(id);
  });
});

describe('J1939-71 ranges of transmitted values: not available and error are no numbers', () => {
  it('1 byte: up to 0xFA valid, 0xFE error, 0xFF (and 0xFB–0xFD) not available', () => {
    expect([0x00, 0xfa, 0xfb, 0xfd, 0xfe, 0xff].map((r) => j1939Validity(r, 8))).toEqual([0, 0, 1, 1, 2, 1]);
  });
  it('2 bytes: up to 0xFAFF valid, 0xFExx error, 0xFFxx not available', () => {
    expect([0xfaff, 0xfb00, 0xfe00, 0xfeff, 0xff00, 0xffff].map((r) => j1939Validity(r, 16))).toEqual([
      0, 1, 2, 2, 1, 1,
    ]);
  });
  it('4 bytes and 2-bit states', () => {
    expect([0xfaffffff, 0xfe000001, 0xffffffff].map((r) => j1939Validity(r, 32))).toEqual([0, 2, 1]);
    expect([0, 1, 2, 3].map((r) => j1939Validity(r, 2))).toEqual([0, 0, 2, 1]);
  });
});

describe('bit fields as DBC files lay them out (Intel and Motorola)', () => {
  it('Intel: start is the least significant bit, the value runs up through the bytes', () => {
    expect(readBits(bytesOf('003412'), 0, 8, 16, 'intel')).toBe(0x1234);
    expect(readBits(bytesOf('F0'), 0, 4, 4, 'intel')).toBe(0xf);
    expect(readBits(bytesOf('40'), 0, 6, 2, 'intel')).toBe(1);
  });
  it('Motorola: start is the most significant bit, the value runs down then into the next byte', () => {
    expect(readBits(bytesOf('1234'), 0, 7, 16, 'motorola')).toBe(0x1234);
    expect(readBits(bytesOf('0AB0'), 0, 3, 8, 'motorola')).toBe(0xab);
  });
  it("two's complement for signed fields", () => {
    expect(signedOf(0xffff, 16)).toBe(-1);
    expect(signedOf(0x7fff, 16)).toBe(32767);
    expect(signedOf(0b100, 3)).toBe(-4);
  });
});

describe('standard parameters from hand-encoded frames (SAE J1939-71 resolutions, offsets, byte positions)', () => {
  /** One second of each message, so a sample at T0 + 1 holds every value. */
  const one = (pgn: number, data: string) => decode([{ t_s: T0 + 0.5, pgn, data }]).rows[0]!;

  it('SPN 110 engine coolant temperature, ET1 byte 1, 1 °C/bit, −40: 0x78 → 80 °C', () => {
    expect(one(65262, '78FFFFFFFFFFFFFF').coolant_in_c).toBe(80);
  });
  it('SPN 1637 high-resolution coolant temperature, ET3 bytes 3–4, 0.03125 °C/bit, −273: 70 2D → 90.5 °C', () => {
    expect(one(65129, 'FFFF702DFFFFFFFF').coolant_in_c).toBe(90.5);
  });
  it('SPN 171 ambient air temperature, AMB bytes 4–5, 0.03125 °C/bit, −273: 40 25 → 25.0 °C', () => {
    expect(one(65269, 'FFFFFF4025FFFFFF').ambient_c).toBe(25);
  });
  it('SPN 84 wheel-based vehicle speed, CCVS1 bytes 2–3, 1/256 km/h per bit: 00 50 → 80 km/h', () => {
    expect(one(65265, 'FF0050FFFFFFFFFF').speed_kmh).toBe(80);
  });
  it('SPN 975 estimated percent fan speed, FD1 byte 1, 0.4 %/bit: 0x7D → 50 %', () => {
    expect(one(65213, '7DFFFFFFFFFFFFFF').fan_pct).toBe(50);
  });
  it('SPN 190 engine speed E0 2E → 1500 rpm and SPN 513 actual torque 0xE1 → 100 %, with SPN 544 → shaft power', () => {
    // P = T_ref · torque% · 2π n / 60: 2000 N·m × 100 % × 1500 rpm → 314.159 kW (computed).
    const { rows } = decode([{ t_s: T0 + 0.5, pgn: 61444, data: 'FFFFE1E02EFFFFFF' }], undefined, 2000);
    expect(rows[0]!.power_kw).toBeCloseTo((2000 * 1500 * Math.PI) / 30 / 1000, 9);
    // 0x7D → 0 %: no torque, no power.
    expect(
      decode([{ t_s: T0 + 0.5, pgn: 61444, data: 'FFFF7DE02EFFFFFF' }], undefined, 2000).rows[0]!.power_kw,
    ).toBe(0);
    // Without a reference torque there is no power.
    expect(decode([{ t_s: T0 + 0.5, pgn: 61444, data: 'FFFFE1E02EFFFFFF' }]).rows).toHaveLength(0);
  });
  it('prefers SPN 1637 to SPN 110 when both are fresh', () => {
    const { rows } = decode([
      { t_s: T0 + 0.2, pgn: 65262, data: '78FFFFFFFFFFFFFF' },
      { t_s: T0 + 0.3, pgn: 65129, data: 'FFFF702DFFFFFFFF' },
    ]);
    expect(rows[0]!.coolant_in_c).toBe(90.5);
  });
});

describe('not available and error values are missing, never numbers', () => {
  it('0xFF coolant and 0xFExx speed give missing values and are counted', () => {
    const { rows, decoder } = decode([
      { t_s: T0 + 0.1, pgn: 65262, data: 'FFFFFFFFFFFFFFFF' },
      { t_s: T0 + 0.2, pgn: 65265, data: 'FF00FEFFFFFFFFFF' },
      { t_s: T0 + 0.3, pgn: 65213, data: '7DFFFFFFFFFFFFFF' },
    ]);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.coolant_in_c).toBeNaN();
    expect(rows[0]!.speed_kmh).toBeNaN();
    expect(rows[0]!.fan_pct).toBe(50);
    expect(decoder.counts).toMatchObject({ not_available: 1, error_values: 1, decoded: 3 });
  });
  it('a value sent as not available ends the held value at once', () => {
    const { rows } = decode([
      { t_s: T0 + 0.5, pgn: 65262, data: '78FFFFFFFFFFFFFF' },
      { t_s: T0 + 1.5, pgn: 65262, data: 'FFFFFFFFFFFFFFFF' },
      { t_s: T0 + 1.6, pgn: 65213, data: '7DFFFFFFFFFFFFFF' },
    ]);
    expect(rows.map((r) => r.coolant_in_c)).toEqual([80, Number.NaN]);
  });
});

describe('J1939-21 transport protocol: a broadcast announce message (BAM) reassembled', () => {
  /** EC1 of 39 bytes with the reference torque 2500 N·m (0x09C4) in bytes 20–21; the rest 0xFF. */
  const ec1 = new Uint8Array(39).fill(0xff);
  ec1[19] = 0xc4;
  ec1[20] = 0x09;
  const packets = (from = 0) =>
    Array.from({ length: 6 }, (_, k) => {
      const chunk = new Uint8Array(7).fill(0xff);
      chunk.set(ec1.subarray(k * 7, k * 7 + 7));
      return {
        t_s: T0 + 0.1 + 0.05 * (k + 1),
        pgn: 60160,
        destination: 255,
        priority: 7,
        data: (k + 1 + from).toString(16).padStart(2, '0') + Buffer.from(chunk).toString('hex'),
      };
    });
  // TP.CM BAM: control 32, size 39 (0x0027), 6 packets, reserved FF, PGN 65251 (0x00FEE3).
  const announce = {
    t_s: T0 + 0.1,
    pgn: 60416,
    destination: 255,
    priority: 7,
    data: '202700' + '06FFE3FE00',
  };
  const eec1 = { t_s: T0 + 0.5, pgn: 61444, data: 'FFFFAFE02EFFFFFF' }; // 50 %, 1500 rpm

  it('gives SPN 544 engine reference torque from EC1 bytes 20–21, used for shaft power', () => {
    const { rows, decoder } = decode([announce, ...packets(), eec1]);
    // 2500 N·m × 50 % × 1500 rpm × π/30 → 196.35 kW (computed).
    expect(rows[0]!.power_kw).toBeCloseTo((1250 * 1500 * Math.PI) / 30 / 1000, 9);
    expect(decoder.counts).toMatchObject({ bam_completed: 1, bam_broken: 0, decoded: 8 });
  });
  it('the bus value wins over the fleet file once it is known', () => {
    expect(decode([announce, ...packets(), eec1], undefined, 1000).rows[0]!.power_kw).toBeCloseTo(196.35, 2);
  });
  it('abandons a message whose packets come out of sequence or too late', () => {
    const out = decode([announce, ...packets(1), eec1]);
    expect(out.decoder.counts).toMatchObject({ bam_completed: 0, bam_broken: 1 });
    expect(out.rows).toHaveLength(0); // no reference torque, so no power, and nothing else was sent
    const late = packets().map((p, k) => (k === 3 ? { ...p, t_s: p.t_s + 1 } : p));
    expect(decode([announce, ...late, eec1]).decoder.counts.bam_broken).toBe(1);
  });
});

describe('data length and unknown PGNs', () => {
  it('a standard message with another length than 8 is not decoded, and said so', () => {
    const { rows, decoder, complaints } = decode([{ t_s: T0 + 0.5, pgn: 65262, data: '78FF' }]);
    expect(rows).toHaveLength(0);
    expect(decoder.counts.dlc_mismatch).toBe(1);
    expect(complaints).toEqual([
      'dlc_mismatch: PGN 65262 from source 0 has 2 data bytes; it needs exactly 8',
    ]);
  });
  it('PGNs nothing reads are counted by PGN, not decoded', () => {
    const { decoder } = decode([
      { t_s: T0 + 0.1, pgn: 65280, data: '0011223344556677' },
      { t_s: T0 + 0.2, pgn: 65280, data: '0011223344556677' },
      { t_s: T0 + 0.3, pgn: 65262, data: '78FFFFFFFFFFFFFF' },
    ]);
    expect(decoder.counts).toMatchObject({ frames: 3, decoded: 1, unknown_pgn: 2 });
    expect([...decoder.unknownPgns]).toEqual([[65280, 2]]);
  });
});
