import { describe, expect, it } from 'vitest';
import { G_MS2, ROAD_LOAD_DEFAULTS, roadLoad } from '@thermargin/core/drivetrain/road-load';

const base = { mass_kg: 1000, cda_m2: 0, crr: 0, speed_kmh: 36 };

describe('roadLoad: standard road-load equation (Gillespie 1992, ch. 4)', () => {
  it('unit checks (computed): CdA 1 m², 10 m/s, ρ 1.225 → 612.5 W; 1000 kg, Crr 0.01 → 980.665 W', () => {
    expect(roadLoad({ ...base, cda_m2: 1, air_density_kg_m3: 1.225 }).aero_kw).toBeCloseTo(0.6125, 12);
    expect(roadLoad({ ...base, crr: 0.01 }).rolling_kw).toBeCloseTo(0.980665, 12);
  });

  // Worked cases for a car, van, bus and tractor-trailer (computed at ρ 1.225 with Gillespie's road-load
  // equation), printed to ≥ 2 decimals: asserted to ±0.005 kW.
  for (const [name, mass_kg, cda_m2, crr, speed_kmh, aero, rolling] of [
    ['car', 1500, 0.66, 0.01, 100, 8.664, 4.086],
    ['light van', 3500, 1.6, 0.009, 90, 15.31, 7.72],
    ['bus', 15000, 4.875, 0.008, 50, 8.0, 16.34],
    ['tractor-trailer', 40000, 6.0, 0.0065, 80, 40.33, 56.66],
  ] as const) {
    it(`${name}: ${mass_kg} kg at ${speed_kmh} km/h → aero ${aero} kW, rolling ${rolling} kW`, () => {
      const r = roadLoad({ mass_kg, cda_m2, crr, speed_kmh, air_density_kg_m3: 1.225 });
      expect(r.aero_kw).toBeCloseTo(aero, 2);
      expect(r.rolling_kw).toBeCloseTo(rolling, 2);
      expect(r.wheel_kw).toBeCloseTo(r.aero_kw + r.rolling_kw, 12);
    });
  }

  it('common practice: 125 km/h, ρ 1.2, Cd 0.3 × 2 m² → drag ≈ 15 kW; 1500 kg at Crr 0.01 adds ≈ 5 kW (±5 %)', () => {
    const r = roadLoad({ mass_kg: 1500, cda_m2: 0.3 * 2, crr: 0.01, speed_kmh: 125, air_density_kg_m3: 1.2 });
    expect(Math.abs(r.aero_kw / 15 - 1)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(r.rolling_kw / 5 - 1)).toBeLessThanOrEqual(0.05);
  });

  it('defaults: ρ 1.2 kg/m³, level road, steady speed', () => {
    const r = roadLoad({ ...base, cda_m2: 1 });
    expect(ROAD_LOAD_DEFAULTS.air_density_kg_m3).toBe(1.2);
    expect(r.aero_kw).toBeCloseTo(0.6, 12);
    expect(r.grade_kw).toBe(0);
    expect(r.inertia_kw).toBe(0);
    expect(roadLoad({ ...base, cda_m2: 1, air_density_kg_m3: undefined }).aero_kw).toBe(r.aero_kw);
  });

  it('grade: weight · sin θ · v, rolling on the normal force cos θ; negative downhill', () => {
    const up = roadLoad({ ...base, crr: 0.01, grade_pct: 10 });
    const theta = Math.atan(0.1);
    expect(up.grade_kw).toBeCloseTo((1000 * G_MS2 * Math.sin(theta) * 10) / 1000, 12);
    expect(up.rolling_kw).toBeCloseTo((1000 * G_MS2 * 0.01 * Math.cos(theta) * 10) / 1000, 12);
    const down = roadLoad({ ...base, crr: 0.01, grade_pct: -10 });
    expect(down.grade_kw).toBeCloseTo(-up.grade_kw, 12);
    expect(down.wheel_kw).toBeLessThan(0);
  });

  it('inertia: m · a · v, negative when braking', () => {
    expect(roadLoad({ ...base, accel_ms2: 1 }).inertia_kw).toBeCloseTo(10, 12);
    const braking = roadLoad({ ...base, crr: 0.01, accel_ms2: -2 });
    expect(braking.inertia_kw).toBeCloseTo(-20, 12);
    expect(braking.wheel_kw).toBeCloseTo(-20 + 0.980665, 12);
  });

  it('standing still needs no power', () => {
    expect(roadLoad({ mass_kg: 1500, cda_m2: 0.66, crr: 0.01, speed_kmh: 0, grade_pct: 8 }).wheel_kw).toBe(0);
  });

  it('rejects bad input naming the field', () => {
    expect(() => roadLoad({ ...base, mass_kg: 0 })).toThrow(/roadLoad: mass_kg must be > 0/);
    expect(() => roadLoad({ ...base, speed_kmh: -1 })).toThrow(/speed_kmh/);
    expect(() => roadLoad({ ...base, crr: Number.NaN })).toThrow(/crr/);
    expect(() => roadLoad({ ...base, air_density_kg_m3: 0 })).toThrow(/air_density_kg_m3/);
    expect(() => roadLoad({ ...base, grade_pct: Number.POSITIVE_INFINITY })).toThrow(/grade_pct/);
  });
});
