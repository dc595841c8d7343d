import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { readCsvFile } from '@thermargin/cli/import/csv-reader';
import { describe, expect, it } from 'vitest';
import { tempFiles } from '../support/run-cli.ts';

/** The reader's read size (4 MiB): lines are cut across reads at this offset. */
const READ_BYTES = 4 << 20;
const T0 = Date.UTC(2026, 6, 1, 8);
const line = (i: number, pad = '') =>
  `${new Date(T0 + i * 1000).toISOString()},bus-01,${i % 90}.5${pad},60,80,35,0\r\n`;

describe('readCsvFile across reads', () => {
  it('reads every row of a CRLF file whose line end straddles a read and whose one line outgrows the buffer', () => {
    let text = 'time,vehicle,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct\r\n';
    let i = 0;
    // Up to just before the first read ends, then one row padded (spaces are trimmed) so that its
    // CR is the last byte of the first read and its LF the first of the next.
    while (text.length + line(i).length < READ_BYTES - 200) text += line(i++);
    text += line(i, ' '.repeat(READ_BYTES + 1 - text.length - line(i).length));
    i++;
    expect(text.lastIndexOf('\r')).toBe(READ_BYTES - 1);
    // A row longer than the whole read buffer (its extra column is ignored), then more rows, no final newline.
    text += line(i++).replace('\r\n', `,${'x'.repeat(READ_BYTES + 10)}\r\n`);
    while (i < 150_000) text += line(i++);
    text = text.slice(0, -2);
    const file = join(tempFiles({}), 'big.csv');
    writeFileSync(file, text, 'latin1');
    const times: number[] = [];
    const speeds: number[] = [];
    const bad: string[] = [];
    const rows = readCsvFile(
      file,
      {
        sample(vehicle, values, trip) {
          expect([vehicle, trip]).toEqual(['bus-01', undefined]);
          times.push(values[0]!);
          speeds.push(values[1]!);
        },
        bad: (where, reason) => bad.push(`${where} ${reason}`),
      },
      undefined,
      { max_line_bytes: 16 << 20 }, // the line limit raised over the read size
    );
    expect(bad).toEqual([]);
    expect(rows).toBe(150_000);
    expect(times.every((t, k) => t === T0 + k * 1000)).toBe(true);
    expect(speeds.every((v, k) => v === (k % 90) + 0.5)).toBe(true);
  });
});
