import { SIGNAL_NAMES, type Sample } from '@thermargin/shared';
import { blankSample } from './quick-sample.ts';

/**
 * Samples as one Float64Array (transferred between threads without a copy) and the distinct ids they
 * name: posting the objects themselves costs the receiving thread about as much as JSON.parse did.
 * Per sample: time_ms, vehicle index, trip index (-1: none), then SIGNAL_NAMES (NaN: absent — a
 * stored signal is always finite).
 */
export interface PackedSamples {
  numbers: Float64Array<ArrayBuffer>;
  ids: string[];
}

const STRIDE = 3 + SIGNAL_NAMES.length;

export function packSamples(samples: readonly Sample[]): PackedSamples {
  const numbers = new Float64Array(samples.length * STRIDE);
  const ids: string[] = [];
  const index = new Map<string, number>();
  const idIndex = (id: string) => {
    let i = index.get(id);
    if (i === undefined) index.set(id, (i = ids.push(id) - 1));
    return i;
  };
  let o = 0;
  for (const s of samples) {
    numbers[o++] = s.time_ms;
    numbers[o++] = idIndex(s.vehicle);
    numbers[o++] = s.trip === undefined ? -1 : idIndex(s.trip);
    for (const name of SIGNAL_NAMES) numbers[o++] = s[name] ?? Number.NaN;
  }
  return { numbers, ids };
}

export function unpackSamples({ numbers, ids }: PackedSamples): Sample[] {
  const out: Sample[] = new Array(numbers.length / STRIDE);
  for (let i = 0, o = 0; o < numbers.length; i++) {
    const s = blankSample();
    s.time_ms = numbers[o++];
    s.vehicle = ids[numbers[o++]!];
    const trip = numbers[o++]!;
    if (trip >= 0) s.trip = ids[trip];
    for (const name of SIGNAL_NAMES) {
      const v = numbers[o++]!;
      if (!Number.isNaN(v)) s[name] = v;
    }
    out[i] = s as unknown as Sample;
  }
  return out;
}
