import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { CAN_EXTENDED } from '@thermargin/shared';
import {
  LINE_BAD,
  LINE_BLANK,
  LINE_FRAME,
  LINE_NO_DATA,
  looksLikeCandump,
  newParsedFrame,
  parseCandumpLine,
} from '@thermargin/logger-data/candump';
import { readCandumpFile } from '@thermargin/logger-data/io/candump-file';
import { forEachLine, MAX_LINE_BYTES, READ_BYTES } from '@thermargin/logger-data/io/lines';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

const parse = (line: string) => {
  const f = newParsedFrame();
  const b = Buffer.from(line, 'latin1');
  const kind = parseCandumpLine(b, 0, b.length, f);
  return { kind, ...f, data: Buffer.from(f.data.subarray(0, f.length)).toString('hex').toUpperCase() };
};

describe('candump -l lines (can-utils log format)', () => {
  it('reads time, 29-bit identifier and data', () => {
    const f = parse('(1717230000.123456) can0 18FEEE00#7DFFFFFFFFFFFFFF');
    expect(f).toMatchObject({
      kind: LINE_FRAME,
      time_us: 1717230000123456,
      length: 8,
      data: '7DFFFFFFFFFFFFFF',
    });
    expect(f.id).toBe((0x18feee00 | CAN_EXTENDED) >>> 0);
  });
  it('reads 11-bit identifiers, empty data, lower case, a direction flag and a padded length code', () => {
    expect(parse('(1.000001) vcan0 123#')).toMatchObject({
      kind: LINE_FRAME,
      id: 0x123,
      length: 0,
      time_us: 1000001,
    });
    expect(parse('(1.5) can1 0cf00400#ffff7de02effffff T')).toMatchObject({
      kind: LINE_FRAME,
      time_us: 1500000,
      length: 8,
    });
    expect(parse('(1.5) can1 123#1122_9')).toMatchObject({ kind: LINE_FRAME, length: 2, data: '1122' });
  });
  it('takes remote, CAN FD and error frames as lines without data', () => {
    expect(parse('(1.0) can0 123#R').kind).toBe(LINE_NO_DATA);
    expect(parse('(1.0) can0 18FEEE00##1112233').kind).toBe(LINE_NO_DATA);
    expect(parse('(1.0) can0 20000080#0000000000000000').why).toBe('error frame');
  });
  it('skips blank lines and names what is wrong with an odd one', () => {
    expect(parse('   ').kind).toBe(LINE_BLANK);
    const why = (l: string) => {
      const f = parse(l);
      expect(f.kind).toBe(LINE_BAD);
      return f.why;
    };
    expect(why('hello')).toBe('does not start with "(seconds.microseconds)"');
    expect(why('(17x.5) can0 123#00')).toBe('the time is not seconds.microseconds');
    expect(why('(1.5) can0 18FEEE00#7DF')).toBe('odd number of hex digits in the data');
    expect(why('(1.5) can0 18FEEE00#7DXX')).toBe('the data is not hex');
    expect(why('(1.5) can0 18FEEE00#001122334455667788')).toBe('more than 8 data bytes');
    expect(why('(1.5) can0 18FEE#00')).toBe('the identifier is neither 3 nor 8 hex digits');
    expect(why('(1.5) can0 4FFFFFFF#00')).toBe('identifier 4fffffff is over 29 bits');
    expect(why('(1.5) can0')).toBe('no frame after the interface');
    expect(why('(1.5) can0 18FEEE00#00 extra')).toBe('text after the frame');
  });
  it('never throws on arbitrary text', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 80 }), (s) => {
        expect([LINE_FRAME, LINE_BLANK, LINE_NO_DATA, LINE_BAD]).toContain(parse(s).kind);
      }),
      { numRuns: 3000 },
    );
  });
  it('is detected by content', () => {
    expect(looksLikeCandump('\n(1717230000.123456) can0 18FEEE00#7D\n')).toBe(true);
    expect(looksLikeCandump('time,vehicle,speed_kmh\n')).toBe(false);
  });
});

describe('reading a candump log file', () => {
  it('hands frames over in order and names each unusable line by file:line', () => {
    const dir = mkdtempSync(join(tmpdir(), 'candump-'));
    const file = join(dir, 'log.txt');
    writeFileSync(
      file,
      [
        '(1717230000.100000) can0 18FEEE00#78FFFFFFFFFFFFFF',
        'garbage line',
        '(1717230000.200000) can0 18FEBD00#7DFFFFFFFFFFFFFF',
        '(1717230000.150000) can0 18FEBD00#7DFFFFFFFFFFFFFF',
        '(1717230000.300000) can0 123#R',
        '(1717230000.400000) can0 18FEF100#FF0050FFFFFFFF', // 7 bytes: parsed; the decoder judges the length
      ].join('\r\n'),
    );
    const seen: string[] = [];
    const bad: string[] = [];
    const c = readCandumpFile(
      file,
      (t, id, len) => seen.push(`${t} ${(id & 0x1fffffff).toString(16)} ${len}`),
      (where, reason, detail) => bad.push(`${where.slice(dir.length + 1)}: ${reason}: ${detail}`),
    );
    expect(seen).toEqual([
      '1717230000100000 18feee00 8',
      '1717230000200000 18febd00 8',
      '1717230000400000 18fef100 7',
    ]);
    expect(bad).toEqual([
      'log.txt:2: candump_syntax: does not start with "(seconds.microseconds)"',
      'log.txt:4: clock_back: time 1717230000.150000 is before the frame before it',
    ]);
    expect(c).toEqual({ lines: 6, frames: 3, bad_lines: 1, no_data: 1, clock_back: 1 });
  });

  it('refuses a line too long to be a log line, naming it, instead of buffering the file whole', () => {
    const dir = mkdtempSync(join(tmpdir(), 'candump-'));
    const file = join(dir, 'huge.log');
    writeFileSync(file, `(1.0) can0 123#00\n${'F'.repeat(MAX_LINE_BYTES + 10)}\n(2.0) can0 123#00\n`);
    const seen: number[] = [];
    expect(() =>
      readCandumpFile(
        file,
        (t) => seen.push(t),
        () => {},
      ),
    ).toThrow(`${file}:2: line longer than ${MAX_LINE_BYTES} bytes`);
    expect(seen).toEqual([1_000_000]);
  });

  it('takes the one line limit of every data file (--max-line-bytes), lower or above the read size', () => {
    const dir = mkdtempSync(join(tmpdir(), 'candump-'));
    const file = join(dir, 'limits.log');
    const long = `(1.5) can0 123#00 ${'x'.repeat(READ_BYTES + 100)}`; // one line over a whole read
    writeFileSync(file, `(1.0) can0 123#00\n${long}\n(2.0) can0 123#00\n`);
    const read = (max: number) => {
      const bad: string[] = [];
      readCandumpFile(
        file,
        () => {},
        (where, reason) => bad.push(`${where} ${reason}`),
        undefined,
        max,
      );
      return bad;
    };
    expect(() => read(64)).toThrow(
      `${file}:2: line longer than 64 bytes (no line break within it); if the file is right, raise --max-line-bytes`,
    );
    expect(read(2 * READ_BYTES)).toEqual([`${file}:2 candump_syntax`]);
    let lines = 0;
    forEachLine(file, () => lines++, undefined, 2 * READ_BYTES);
    expect(lines).toBe(3);
    expect(() => forEachLine(file, () => {})).toThrow(`${file}:2: line longer than ${MAX_LINE_BYTES} bytes`);
  });
});
