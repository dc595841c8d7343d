import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli, tempFiles } from '../support/run-cli.ts';
import { BUS_CONFIG } from '../support/vehicle-fixture.ts';

const FLEET = JSON.stringify({ vehicles: [BUS_CONFIG, { ...BUS_CONFIG, id: 'bus-02' }] });
const at = (s: number) => new Date(Date.UTC(2026, 6, 1, 8) + s * 1000).toISOString();

/** bus-01 with trip ids, columns reordered, an extra column, a UTF-8 BOM and every kind of bad row. */
const A = [
  '\uFEFFvehicle,time,trip,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct,note',
  `bus-01,${at(0)},T1,85,60,80,35,0,ok`,
  `bus-01,${at(1)},T1,85,60,80.5,35,0,`,
  `bus-01,${at(2)},bad trip,85,60,80,35,0,`,
  `bus 01,${at(3)},T1,85,60,80,35,0,`,
  `bus-01,2026-13-01T00:00:00Z,T1,85,60,80,35,0,`,
  `bus-01,${at(4)},T1,"1,5",60,80,35,0,`,
  `bus-01,${at(5)},T1,"85",60,80,35,0,"quoted, with comma"`,
  '',
  '   ',
  `van-09,${at(6)},T1,85,60,80,35,0,`,
  `bus-01,${at(6)},T1,85,60,80,35`,
  ` bus-01 , ${at(7)} ,T1, 85 ,60,80,35,0,`,
  `bus-01,${at(8)},T1,85,sixty,80,35,0,`,
  `bus-02,${at(0)},,85,60,80,35,0,`,
  `bus-02,${at(1)},,85,60,80,35,0,`,
  `bus-01,${at(9)},T1,85,60,80,35,0,`,
].join('\n');

/** bus-02 continued with CRLF line ends, no trip column and no newline after the last row. */
const B = [
  'time,vehicle,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct',
  `${at(2)},bus-02,85,60,80,35,0`,
  `${at(3)},bus-02,85,60,80,35`,
  `${at(4)},bus-02,85,NaN,80,35,0`,
  `${at(4)},bus-02,-,60,80,35,0`,
  `yesterday,bus-02,85,60,80,35,0`,
  `${at(5)},bus-02,85,60,80,35,0`,
  `${at(5)},bus-02,85,60,80,35,0`,
  `${at(6)},bus-02,85,60,80,35,0`,
].join('\r\n');

describe('thermargin analyze on a folder of files from several vehicles', () => {
  it('names every bad row by file:line, counts each reason and keeps the good rows', () => {
    const dir = tempFiles({ 'fleet.json': FLEET, 'a.csv': A, 'notes.txt': 'not data' });
    mkdirSync(join(dir, 'sub'));
    writeFileSync(join(dir, 'sub', 'b.csv'), B);
    const r = runCli(['analyze', '--fleet', join(dir, 'fleet.json'), '--data', dir]);
    expect(r.code).toBe(0);
    const a = join(dir, 'a.csv');
    const b = join(dir, 'sub', 'b.csv');
    expect(r.stderr.trim().split('\n')).toEqual([
      `${a}:4: row skipped: csv_bad_trip`,
      `${a}:5: row skipped: csv_bad_vehicle`,
      `${a}:6: row skipped: csv_bad_time`,
      `${a}:7: row skipped: csv_comma_in_field`,
      `${a}:8: row skipped: csv_comma_in_field`,
      `${a}:12: row skipped: csv_short_row`,
      `${a}:14: row skipped: csv_not_a_number:power_kw`,
      `${b}:3: row skipped: csv_short_row`,
      `${b}:4: row skipped: csv_not_a_number:power_kw`,
      `${b}:5: row skipped: csv_not_a_number:speed_kmh`,
      '… 1 more bad rows skipped (counted in rejected.by_reason)',
      'rows of vehicles not in the fleet file were skipped: van-09',
      'analysed 11 rows of 2 vehicles; 13 rejected',
    ]);
    const out = JSON.parse(r.stdout);
    expect(out.rejected).toEqual({
      total: 13,
      by_reason: {
        csv_bad_trip: 1,
        csv_bad_vehicle: 1,
        csv_bad_time: 2,
        csv_comma_in_field: 2,
        csv_short_row: 2,
        'csv_not_a_number:power_kw': 2,
        'csv_not_a_number:speed_kmh': 1,
        unknown_vehicle: 1,
        duplicate_time: 1,
      },
    });
    type Trip = { trip: string; samples: number; rejected: number };
    const trips = out.vehicles.map((v: { id: string; trips: Trip[] }) => [
      v.id,
      v.trips.map((t) => [t.trip, t.samples, t.rejected]),
    ]);
    // bus-02's trip runs across both files; its duplicate row is rejected within the trip.
    expect(trips).toEqual([
      ['bus-01', [['T1', 4, 0]]],
      ['bus-02', [['20260701T080000Z', 5, 1]]],
    ]);
  });
});
