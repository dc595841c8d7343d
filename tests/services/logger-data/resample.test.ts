import { describe, expect, it } from 'vitest';
import { decode, type TestFrame } from './frames.ts';

const T0 = 1_717_230_000;
const speedHex = (kmh: number) => {
  const raw = Math.round(kmh * 256);
  return `FF${(raw & 0xff).toString(16).padStart(2, '0')}${(raw >> 8).toString(16).padStart(2, '0')}FFFFFFFFFF`;
};

describe('samples at a fixed interval by last value held, with a staleness limit', () => {
  it('each sample holds the last value received at or before its time', () => {
    // Speed every 100 ms rising 1 km/h a frame; fan once a second.
    const frames: TestFrame[] = [];
    for (let k = 1; k <= 30; k++) frames.push({ t_s: T0 + k / 10, pgn: 65265, data: speedHex(k) });
    for (let s = 0; s < 3; s++) frames.push({ t_s: T0 + s + 0.05, pgn: 65213, data: '7DFFFFFFFFFFFFFF' });
    frames.sort((a, b) => a.t_s - b.t_s);
    const { rows } = decode(frames);
    // Grid from T0 + 1 (first frame rounded up) to T0 + 3 (last rounded up).
    expect(rows.map((r) => r.time_ms / 1000)).toEqual([T0 + 1, T0 + 2, T0 + 3]);
    // At T0 + 1 the frame sent at exactly T0 + 1.0 counts: 10 km/h.
    expect(rows.map((r) => r.speed_kmh)).toEqual([10, 20, 30]);
    expect(rows.every((r) => r.fan_pct === 50)).toBe(true);
  });

  it('a signal older than its staleness limit is missing; while the bus is silent no samples are made', () => {
    const frames: TestFrame[] = [
      { t_s: T0 + 0.5, pgn: 65213, data: '7DFFFFFFFFFFFFFF' },
      ...Array.from({ length: 8 }, (_, k) => ({ t_s: T0 + 0.6 + k, pgn: 65265, data: speedHex(50) })),
      // an hour later the vehicle is back
      { t_s: T0 + 3600.5, pgn: 65265, data: speedHex(20) },
    ];
    const { rows } = decode(frames);
    const fan = rows.map((r) => [r.time_ms / 1000 - T0, r.fan_pct]);
    // fan received at +0.5: fresh up to +5.5 (5 s default), so at +1 … +5, missing from +6.
    expect(fan.slice(0, 8)).toEqual([
      [1, 50],
      [2, 50],
      [3, 50],
      [4, 50],
      [5, 50],
      [6, Number.NaN],
      [7, Number.NaN],
      [8, Number.NaN],
    ]);
    // the last frame at +7.6: the bus is live up to +8, then silent until +3600.5.
    expect(rows.map((r) => r.time_ms / 1000 - T0)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 3601]);
  });

  it('the interval and staleness come from the mapping', () => {
    const frames = Array.from({ length: 20 }, (_, k) => ({ t_s: T0 + k / 2, pgn: 65265, data: speedHex(k) }));
    const { rows } = decode(frames, { interval_s: 2, stale_s: 0.25 });
    expect(rows.map((r) => [r.time_ms / 1000 - T0, r.speed_kmh])).toEqual([
      [0, 0],
      [2, 4],
      [4, 8],
      [6, 12],
      [8, 16],
    ]);
  });
});
