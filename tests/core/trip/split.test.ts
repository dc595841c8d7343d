import { columnsFromSamples } from '@thermargin/shared';
import { splitTrips, tripIdFromTime } from '@thermargin/core/trip/split';
import { describe, expect, it } from 'vitest';
import { highwaySample } from '../../support/vehicle-fixture.ts';

describe('splitTrips', () => {
  it('splits on gaps of 5 minutes or more when no trip id is given', () => {
    const c = columnsFromSamples([0, 1, 2, 302, 303, 603].map((i) => highwaySample(i)));
    const spans = splitTrips(c);
    expect(spans.map((s) => [s.from, s.to])).toEqual([
      [0, 3],
      [3, 5],
      [5, 6],
    ]);
    expect(spans[0]!.trip).toBe('20260701T080000Z');
  });

  it('follows the trip id where given, even across long gaps', () => {
    const c = columnsFromSamples([
      highwaySample(0, { trip: 'a' }),
      highwaySample(1000, { trip: 'a' }),
      highwaySample(1001, { trip: 'b' }),
    ]);
    expect(splitTrips(c).map((s) => s.trip)).toEqual(['a', 'b']);
  });

  it('names trips by their start time in a form that is a valid id', () => {
    expect(tripIdFromTime(Date.UTC(2026, 0, 2, 3, 4, 5, 678))).toBe('20260102T030405Z');
  });
});
