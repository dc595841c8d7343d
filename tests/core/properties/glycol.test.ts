import { describe, expect, it } from 'vitest';
import {
  GLYCOL_MAX_MASS_FRACTION,
  glycolCp_j_kgk,
  glycolCpByMass_j_kgk,
  glycolDensity_kg_m3,
  glycolDensityByMass_kg_m3,
  glycolFreezePoint_c,
  glycolMassFraction,
} from '@thermargin/core/properties/glycol';

const TEMPS_C = [20, 40, 60, 80, 100] as const;
const relErr = (actual: number, expected: number) => Math.abs(actual / expected - 1);

describe('glycolMassFraction (volumes mixed at 20 °C, computed)', () => {
  // Printed to 3 digits; 40 % is 0.42650, printed 0.427, hence half a digit plus rounding slack.
  for (const [vol, mass] of [
    [30, 0.323],
    [40, 0.427],
    [50, 0.527],
    [60, 0.626],
  ] as const) {
    it(`${vol} vol % → ${mass}`, () => {
      expect(Math.abs(glycolMassFraction(vol) - mass)).toBeLessThanOrEqual(0.0006);
    });
  }

  it('doc example: 50 vol % → 0.5273; 0 and 100 % are the pure fluids', () => {
    expect(glycolMassFraction(50)).toBeCloseTo(0.5273, 4);
    expect(glycolMassFraction(0)).toBe(0);
    expect(glycolMassFraction(100)).toBe(1);
  });

  it('rejects volume % outside 0…100', () => {
    expect(() => glycolMassFraction(-1)).toThrow(RangeError);
    expect(() => glycolMassFraction(101)).toThrow(/glycolMassFraction: glycol volume %/);
    expect(() => glycolMassFraction(Number.NaN)).toThrow(RangeError);
  });
});

describe('Melinder (2010) polynomial, mass fraction (computed from the NREL SecondaryCoolantProps coefficients)', () => {
  // ρ to 0.1 kg/m³ and cp to 1 J/(kg·K) as printed: asserted to half the last digit (≤ rel 1.6e-4).
  const TABLE: [number, number[], number[]][] = [
    [0.3, [1038.0, 1028.8, 1017.5, 1004.3, 989.4], [3718, 3775, 3829, 3878, 3922]],
    [0.4, [1051.9, 1041.4, 1029.1, 1015.4, 1000.5], [3519, 3598, 3670, 3734, 3789]],
    [0.5, [1064.9, 1053.4, 1040.5, 1026.4, 1011.5], [3312, 3413, 3503, 3582, 3646]],
    [0.6, [1077.1, 1064.6, 1050.8, 1036.0, 1020.8], [3098, 3218, 3323, 3410, 3476]],
  ];
  for (const [x, rho, cp] of TABLE) {
    it(`x = ${x}, 20…100 °C`, () => {
      TEMPS_C.forEach((t, i) => {
        expect(Math.abs(glycolDensityByMass_kg_m3(t, x) - rho[i]!)).toBeLessThanOrEqual(0.05 + 1e-9);
        expect(Math.abs(glycolCpByMass_j_kgk(t, x) - cp[i]!)).toBeLessThanOrEqual(0.5 + 1e-9);
      });
    });
  }

  it('50 vol % (x = 0.527) row, through the volume-% functions', () => {
    const rho = [1068.3, 1056.6, 1043.4, 1029.2, 1014.3];
    const cp = [3255, 3361, 3456, 3538, 3604];
    TEMPS_C.forEach((t, i) => {
      expect(Math.abs(glycolDensity_kg_m3(t, 50) - rho[i]!)).toBeLessThanOrEqual(0.05 + 1e-9);
      expect(Math.abs(glycolCp_j_kgk(t, 50) - cp[i]!)).toBeLessThanOrEqual(0.5 + 1e-9);
    });
  });

  it('pins x = 0.4 at 20 °C as the package tests do (FOUND: tests/test_ethlylene_glycol.py, rel 1e-3)', () => {
    expect(relErr(glycolDensityByMass_kg_m3(20, 0.4), 1051.9)).toBeLessThan(1e-4);
    expect(relErr(glycolCpByMass_j_kgk(20, 0.4), 3519)).toBeLessThan(1e-4);
    expect(relErr(glycolDensityByMass_kg_m3(40, 0.2), 1016.4)).toBeLessThan(1e-4);
    expect(relErr(glycolCpByMass_j_kgk(5, 0.2), 3869.5)).toBeLessThan(1e-4);
  });

  it('freezing points 0.1…0.6 (FOUND: the package tests, tolerance 0.01 K)', () => {
    const expected = [-3.357, -7.949, -14.576, -23.813, -35.994, -51.201];
    expected.forEach((tf, i) => {
      expect(glycolFreezePoint_c((i + 1) / 10)).toBeCloseTo(tf, 2);
    });
    expect(glycolFreezePoint_c(0)).toBe(0);
  });

  it('at x = 0 the fit gives 997.35 kg/m³ at 20 °C (a fit, not IAPWS)', () => {
    expect(glycolDensityByMass_kg_m3(20, 0)).toBeCloseTo(997.35, 2);
  });
});

describe('against other sources (cross-source tolerances)', () => {
  // ASHRAE Handbook—Fundamentals, secondary coolants table (volume %, converted to kg/m³).
  const ASHRAE: [number, number[]][] = [
    [30, [1046.4, 1037.9, 1027.6, 1015.1, 1000.8]],
    [40, [1060.9, 1051.8, 1040.9, 1027.8, 1012.9]],
    [50, [1074.5, 1064.9, 1053.2, 1039.6, 1024.1]],
  ];
  for (const [vol, rho] of ASHRAE) {
    it(`density at ${vol} vol % within ±1 % of the ASHRAE table, 20…100 °C`, () => {
      TEMPS_C.forEach((t, i) => {
        expect(relErr(glycolDensity_kg_m3(t, vol), rho[i]!)).toBeLessThanOrEqual(0.01);
      });
    });
  }

  it('60 vol % (mass 0.626, just past the fit) stays within ±1.5 % of the ASHRAE table', () => {
    const rho = [1087.5, 1077.1, 1064.9, 1050.7, 1034.5];
    TEMPS_C.forEach((t, i) => {
      expect(relErr(glycolDensity_kg_m3(t, 60), rho[i]!)).toBeLessThanOrEqual(0.015);
    });
  });

  it('the commonly quoted 50/50 cp of ≈ 3.5 kJ/(kg·K) holds at 80 °C within ±2 % (common practice)', () => {
    expect(relErr(glycolCp_j_kgk(80, 50), 3500)).toBeLessThanOrEqual(0.02);
  });

  it('freezing point by volume % within ±3 K of the published tables (docs/methods.md §1)', () => {
    const table: [number, number][] = [
      [30, -16],
      [40, -25],
      [50, -37],
    ];
    for (const [vol, tf] of table) {
      expect(Math.abs(glycolFreezePoint_c(glycolMassFraction(vol)) - tf)).toBeLessThanOrEqual(3);
    }
  });

  it('0 % glycol is water-like: IAPWS-95 at 0.101325 MPa within ±0.5 % (ρ) and ±1 % (cp); the fit is not IAPWS', () => {
    // IAPWS-95, computed with the open iapws library; 100 °C at 0.2 MPa.
    const iapws: [number, number, number][] = [
      [20, 998.207, 4184.1],
      [40, 992.216, 4179.4],
      [60, 983.196, 4185.0],
      [80, 971.79, 4196.8],
      [100, 958.395, 4215.4],
    ];
    for (const [t, rho, cp] of iapws) {
      expect(relErr(glycolDensity_kg_m3(t, 0), rho)).toBeLessThanOrEqual(0.005);
      expect(relErr(glycolCp_j_kgk(t, 0), cp)).toBeLessThanOrEqual(0.01);
    }
  });
});

describe('validity range', () => {
  it('clamps temperature to [freezing point, 100 °C]', () => {
    expect(glycolDensityByMass_kg_m3(150, 0.4)).toBe(glycolDensityByMass_kg_m3(100, 0.4));
    expect(glycolCpByMass_j_kgk(-60, 0.4)).toBe(glycolCpByMass_j_kgk(glycolFreezePoint_c(0.4), 0.4));
    expect(glycolDensity_kg_m3(-10, 0)).toBe(glycolDensity_kg_m3(0, 0));
  });

  it('throws RangeError for concentration out of range, naming the function', () => {
    expect(() => glycolDensityByMass_kg_m3(20, GLYCOL_MAX_MASS_FRACTION + 0.01)).toThrow(
      /glycolDensityByMass_kg_m3: glycol mass fraction must be within 0…0.63/,
    );
    expect(() => glycolCpByMass_j_kgk(20, -0.1)).toThrow(RangeError);
    expect(() => glycolDensity_kg_m3(20, 70)).toThrow(
      /glycolDensity_kg_m3: 70 vol % glycol is mass fraction 0.722/,
    );
    expect(() => glycolCp_j_kgk(20, -5)).toThrow(RangeError);
    expect(() => glycolCp_j_kgk(Number.NaN, 50)).toThrow(/temperature is NaN/);
  });

  it('accepts the whole fleet-file range 0…60 vol %', () => {
    for (let vol = 0; vol <= 60; vol += 5) {
      expect(glycolDensity_kg_m3(90, vol)).toBeGreaterThan(950);
      expect(glycolCp_j_kgk(90, vol)).toBeGreaterThan(3000);
    }
  });
});
