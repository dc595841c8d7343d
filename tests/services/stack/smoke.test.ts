import type { FramesResponse } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { analysed, expectDemoFindings, runStack, SMOKE_DEMO } from './run-stack.ts';

describe('npm start on the embedded defaults', () => {
  it('back-fills history (a third of the fleet as J1939 frames), analyses trips, flags the fouling and fan-fault buses, keeps the healthy one ok, and stops cleanly', async () => {
    const stack = await runStack(SMOKE_DEMO);
    try {
      const fleet = await analysed(stack);
      expect(stack.log()).toMatch(/history back-filled in \d+ (s|min): [\d,]+ samples stored/);
      // The start-up output says when the analysis has caught up, with its totals.
      await expect
        .poll(() => stack.log(), { timeout: 300_000, interval: 1000 })
        .toMatch(/analysis \[#+\] 100 % [\d,]+ trips of \d+ vehicles in \d+ (s|min)\nanalysis caught up in/);
      expectDemoFindings(fleet);
      // Every third vehicle's logger sends frames: the fan-fault bus and the truck among 6.
      const frames = await stack.get<FramesResponse>('/api/intake/frames');
      expect(frames.vehicles.map((v) => v.vehicle)).toEqual(['bus-03', 'truck-01']);
      for (const v of frames.vehicles) expect(v).toMatchObject({ decoded: v.frames, incomplete: 0 });
    } finally {
      expect(await stack.stop(), stack.log().slice(-2000)).toBe(0);
    }
  }, 900_000);
});
