import { describe, expect, it } from 'vitest';
import { analysed, expectDemoFindings, runStack, SMOKE_DEMO } from './run-stack.ts';

describe('npm start on the embedded defaults', () => {
  it('back-fills history, analyses trips, flags the fouling and fan-fault buses, keeps the healthy one ok, and stops cleanly', async () => {
    const stack = await runStack(SMOKE_DEMO);
    try {
      const fleet = await analysed(stack);
      expect(stack.log()).toMatch(/history back-filled in \d+ s/);
      expectDemoFindings(fleet);
    } finally {
      expect(await stack.stop(), stack.log().slice(-2000)).toBe(0);
    }
  }, 900_000);
});
