import { describe, expect, it } from 'vitest';
import { atLeast } from '../../web/src/charts/Chart.tsx';
import { placeLabel } from '../../web/src/charts/overlays.ts';

describe('chart labels and axes', () => {
  it('places a label where it overlaps none already placed', () => {
    const placed: [number, number, number, number][] = [];
    expect(placeLabel(placed, [[10, 10]], 50, 12)).toEqual([10, 10]);
    // The same spot is taken: the second try is used.
    expect(
      placeLabel(
        placed,
        [
          [20, 15],
          [20, 30],
        ],
        50,
        12,
      ),
    ).toEqual([20, 30]);
    // Every try taken: moved down a row at a time from the first.
    expect(placeLabel(placed, [[10, 10]], 50, 12)).toEqual([10, 46]);
    for (let i = 0; i < placed.length; i++)
      for (let j = i + 1; j < placed.length; j++) {
        const [a, b] = [placed[i]!, placed[j]!];
        const apart =
          a[0] + a[2] <= b[0] || b[0] + b[2] <= a[0] || a[1] + a[3] <= b[1] || b[1] + b[3] <= a[1];
        expect(apart, `${a} / ${b}`).toBe(true);
      }
  });

  it('widens a flat range to the least span about its middle, and leaves a wide one alone', () => {
    expect(atLeast(80, 80.01, 4)).toEqual([78.005, 82.005]);
    expect(atLeast(20, 90, 4)).toEqual([20, 90]);
    expect(atLeast(null, null, 10)).toEqual([0, 10]);
  });
});
