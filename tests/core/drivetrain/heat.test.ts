import { describe, expect, it } from 'vitest';
import { chainEfficiency, energyInput_kw, heatToCoolant_kw } from '@thermargin/core/drivetrain/heat';

describe('drivetrain heat (docs/methods.md §2: heat ≈ power × coolant share ÷ efficiency)', () => {
  it('doc examples', () => {
    expect(chainEfficiency(0.93, 0.93, 0.93)).toBeCloseTo(0.804357, 12);
    expect(energyInput_kw(20, 0.804357)).toBeCloseTo(24.865, 3);
    expect(heatToCoolant_kw(20, 1 / 3, 1 / 3)).toBeCloseTo(20, 12);
  });

  it('common practice: with the one-third rule a 20 kW engine sends ≈ 20 kW to the coolant', () => {
    expect(heatToCoolant_kw(20, 1 / 3, 1 / 3)).toBeCloseTo(20, 6);
  });

  it('common practice: battery–inverter–motor at 0.93 each needs ≈ 25 kW in for 20 kW out, ≈ 5 kW cooled', () => {
    const eta = chainEfficiency(0.93, 0.93, 0.93);
    expect(energyInput_kw(20, eta)).toBeCloseTo(25, 0);
    expect(heatToCoolant_kw(20, eta, 1 - eta)).toBeCloseTo(5, 0);
  });

  it('common practice: a 0.60 stack, 0.93 battery charging and the same chain is ≈ 45 % efficient, ≈ 25 kW cooled', () => {
    const eta = chainEfficiency(0.6, 0.93, 0.93, 0.93, 0.93);
    expect(eta).toBeCloseTo(0.45, 2);
    expect(heatToCoolant_kw(20, eta, 1 - eta)).toBeCloseTo(25, 0);
  });

  it('regeneration adds no heat', () => {
    expect(heatToCoolant_kw(-40, 0.8, 0.2)).toBe(0);
    expect(heatToCoolant_kw(0, 0.8, 0.2)).toBe(0);
  });

  it('rejects efficiencies and fractions outside their range, naming the function', () => {
    expect(() => heatToCoolant_kw(10, 0, 0.2)).toThrow(/heatToCoolant_kw: drivetrain_efficiency/);
    expect(() => heatToCoolant_kw(10, 0.8, 1.2)).toThrow(/coolant_heat_fraction/);
    expect(() => heatToCoolant_kw(Number.NaN, 0.8, 0.2)).toThrow(/power_kw is NaN/);
    expect(() => energyInput_kw(10, 1.1)).toThrow(/energyInput_kw: efficiency/);
    expect(() => chainEfficiency()).toThrow(/at least one stage/);
    expect(() => chainEfficiency(0.9, -0.1)).toThrow(/chainEfficiency: stage 1/);
  });
});
