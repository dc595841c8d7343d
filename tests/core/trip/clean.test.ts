import { columnsFromSamples } from '@thermargin/shared';
import { cleanSamples } from '@thermargin/core/trip/clean';
import { describe, expect, it } from 'vitest';
import { highwaySample } from '../../support/vehicle-fixture.ts';

const run = (samples: ReturnType<typeof highwaySample>[]) => cleanSamples(columnsFromSamples(samples));

describe('cleanSamples', () => {
  it('orders by time and drops duplicated times, keeping the first', () => {
    const s = [highwaySample(2), highwaySample(0), highwaySample(1), highwaySample(1, { power_kw: 99 })];
    const { columns, rejections } = run(s);
    expect(Array.from(columns.time_ms).map((t) => (t - s[1]!.time_ms) / 1000)).toEqual([0, 1, 2]);
    expect(columns.power_kw[1]).toBe(60);
    expect(rejections.by_reason).toEqual({ duplicate_time: 1 });
  });

  it('rejects implausible and missing required values with their reason, and counts every one', () => {
    const s = [
      highwaySample(0),
      highwaySample(1, { coolant_in_c: 215 }),
      highwaySample(2, { speed_kmh: Number.NaN }),
      highwaySample(3, { power_kw: 1e308 }),
      highwaySample(4, { ambient_c: Number.POSITIVE_INFINITY }),
      highwaySample(5, { time_ms: Date.UTC(1970, 0, 1) }),
      highwaySample(6, { time_ms: Number.NaN }),
      highwaySample(7),
    ];
    const { columns, rejections } = run(s);
    expect(columns.n).toBe(2);
    expect(rejections.total).toBe(6);
    expect(rejections.by_reason).toEqual({
      coolant_in_c_out_of_range: 1,
      speed_kmh_missing: 1,
      power_kw_out_of_range: 1,
      ambient_c_out_of_range: 1,
      time_before_2000: 1,
      time_invalid: 1,
    });
    // Only the samples with a usable time are placed on the time axis.
    expect(rejections.events).toHaveLength(5);
  });

  it('rejects a single-sample coolant spike but keeps a real step', () => {
    const spike = [0, 1, 2, 3, 4].map((i) => highwaySample(i, { coolant_in_c: i === 2 ? 110 : 80 }));
    expect(run(spike).rejections.by_reason).toEqual({ spike_coolant_in_c: 1 });
    const step = [0, 1, 2, 3, 4].map((i) => highwaySample(i, { coolant_in_c: i >= 2 ? 95 : 80 }));
    expect(run(step).rejections.total).toBe(0);
  });

  it('drops an implausible optional value but keeps the sample', () => {
    const { columns, rejections } = run([highwaySample(0, { coolant_flow_lpm: -5, derate: 3 })]);
    expect(columns.n).toBe(1);
    expect(Number.isNaN(columns.coolant_flow_lpm[0]!)).toBe(true);
    expect(Number.isNaN(columns.derate[0]!)).toBe(true);
    expect(rejections.dropped_values).toEqual({ coolant_flow_lpm_out_of_range: 1, derate_out_of_range: 1 });
  });
});
