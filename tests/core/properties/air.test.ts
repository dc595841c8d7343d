import { describe, expect, it } from 'vitest';
import { AIR_CP_J_KGK, dryAirDensity_kg_m3, R_DRY_AIR_J_KGK } from '@thermargin/core/properties/air';

describe('dry air', () => {
  it('1.225 kg/m³ at 15 °C, 101325 Pa to 4 digits (U.S. Standard Atmosphere 1976, FOUND)', () => {
    expect(dryAirDensity_kg_m3(15)).toBeCloseTo(1.225, 4);
  });

  it('R = R*/M0 = 8.31432 / 28.9644e-3 within 0.01 % (U.S. Standard Atmosphere 1976)', () => {
    expect(Math.abs(R_DRY_AIR_J_KGK / (8.31432 / 28.9644e-3) - 1)).toBeLessThan(1e-4);
  });

  it.each([
    [0, 1.2923],
    [15, 1.225],
    [20, 1.2041],
    [25, 1.1839],
    [40, 1.1272],
    [60, 1.0595],
  ])(
    'ideal-gas density at %i °C → %f kg/m³ (p/(R·T), U.S. Standard Atmosphere 1976 R, computed)',
    (t, rho) => {
      expect(dryAirDensity_kg_m3(t)).toBeCloseTo(rho, 4);
    },
  );

  it('scales with pressure', () => {
    expect(dryAirDensity_kg_m3(15, 101325 / 2)).toBeCloseTo(0.6125, 4);
  });

  it('cp within ±0.3 % of 1005 (standard-atmosphere tables) and of 1007 (Incropera A.4, from memory)', () => {
    expect(Math.abs(AIR_CP_J_KGK / 1005 - 1)).toBeLessThanOrEqual(0.003);
    expect(Math.abs(AIR_CP_J_KGK / 1007 - 1)).toBeLessThanOrEqual(0.003);
  });

  it('rejects temperatures at or below absolute zero and non-positive pressure', () => {
    expect(() => dryAirDensity_kg_m3(-273.15)).toThrow(/dryAirDensity_kg_m3: temperature/);
    expect(() => dryAirDensity_kg_m3(20, 0)).toThrow(/pressure_pa must be > 0/);
    expect(() => dryAirDensity_kg_m3(Number.NaN)).toThrow(RangeError);
  });
});
