import { describe, expect, it } from 'vitest';
import {
  E_TN_HHV_V,
  E_TN_LHV_V,
  FARADAY_C_MOL,
  stackEfficiency,
  stackHeat_kw,
} from '@thermargin/core/drivetrain/fuel-cell';

describe('fuel-cell stack heat (Larminie & Dicks, Fuel Cell Systems Explained, 2003)', () => {
  it('thermoneutral voltages Δh/(2F): 1.2532 V (LHV) and 1.4812 V (HHV) (computed; Δh from CODATA key values, from memory)', () => {
    expect(FARADAY_C_MOL).toBe(96485.33212);
    expect(E_TN_LHV_V).toBeCloseTo(1.2532, 4);
    expect(E_TN_HHV_V).toBeCloseTo(1.4812, 4);
  });

  it('Larminie & Dicks round them to 1.25 V and 1.48 V (from memory)', () => {
    expect(E_TN_LHV_V).toBeCloseTo(1.25, 2);
    expect(E_TN_HHV_V).toBeCloseTo(1.48, 2);
  });

  const worked = { current_a: 300, cells: 300, stack_voltage_v: 300 * 0.7 };

  it('worked check (computed): N 300, I 300 A, V_cell 0.70 → 49.77 kW (1.253 V), 70.29 kW (1.481 V)', () => {
    expect(stackHeat_kw({ ...worked, thermoneutral_v: 1.253 })).toBeCloseTo(49.77, 9);
    expect(stackHeat_kw({ ...worked, thermoneutral_v: 1.254 })).toBeCloseTo(49.86, 9);
    expect(stackHeat_kw({ ...worked, thermoneutral_v: 1.481 })).toBeCloseTo(70.29, 9);
  });

  it('defaults to the LHV thermoneutral voltage', () => {
    expect(stackHeat_kw(worked)).toBeCloseTo((300 * (300 * E_TN_LHV_V - 210)) / 1000, 12);
  });

  it('equals the Larminie & Dicks form P_e · (E_tn/V_cell − 1)', () => {
    const p_e_kw = (300 * 210) / 1000;
    expect(stackHeat_kw({ ...worked, thermoneutral_v: 1.25 })).toBeCloseTo(p_e_kw * (1.25 / 0.7 - 1), 12);
  });

  it('stack efficiency V_cell / E_tn: 0.70 V → 55.9 %, 0.65 V → 51.9 % and Q/P_e 0.928 (computed)', () => {
    expect(stackEfficiency(0.7, 1.253)).toBeCloseTo(0.559, 3);
    expect(stackEfficiency(0.65, 1.253)).toBeCloseTo(0.519, 3);
    expect(1 / stackEfficiency(0.65, 1.253) - 1).toBeCloseTo(0.928, 3);
  });

  it('no current, no heat', () => {
    expect(stackHeat_kw({ current_a: 0, cells: 300, stack_voltage_v: 290 })).toBe(0);
  });

  it('rejects impossible input', () => {
    expect(() => stackHeat_kw({ ...worked, stack_voltage_v: 400 })).toThrow(
      /stackHeat_kw: stack_voltage_v 400 V is above/,
    );
    expect(() => stackHeat_kw({ ...worked, current_a: -1 })).toThrow(/current_a/);
    expect(() => stackHeat_kw({ ...worked, cells: 0 })).toThrow(/cells must be a positive integer/);
    expect(() => stackEfficiency(1.3)).toThrow(/stackEfficiency: cell_voltage_v/);
  });
});
