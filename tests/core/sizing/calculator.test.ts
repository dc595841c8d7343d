import { chainEfficiency, energyInput_kw, heatToCoolant_kw } from '@thermargin/core/drivetrain/heat';
import { POWERTRAIN_PRESETS } from '@thermargin/core/drivetrain/powertrains';
import { roadLoad } from '@thermargin/core/drivetrain/road-load';
import { answerDesign } from '@thermargin/core/sizing/calculator';
import { compareDrivetrains } from '@thermargin/core/sizing/drivetrain-compare';
import { describe, expect, it } from 'vitest';

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('sizing calculator against the trade facts', () => {
  it('40 °C ambient: a 120 °C limit gives 80 K, an 80 °C limit 40 K, so the same radiator rejects half (common practice)', () => {
    const hot = answerDesign({
      ambient_c: 40,
      heat_kw: 20,
      coolant_limit_c: 120,
      k_w_m2k: 1000,
      fouling_allowance: 0,
      area_m2: 0.25,
    });
    const cool = answerDesign({
      ambient_c: 40,
      heat_kw: 20,
      coolant_limit_c: 80,
      k_w_m2k: 1000,
      fouling_allowance: 0,
      area_m2: 0.25,
    });
    expect(hot.itd_k).toBe(80);
    expect(cool.itd_k).toBe(40);
    expect(hot.required_area_m2).toBeCloseTo(0.25, 12);
    expect(hot.supported_heat_kw).toBeCloseTo(20, 12);
    expect(cool.supported_heat_kw! / hot.supported_heat_kw!).toBeCloseTo(0.5, 12);
    expect(cool.required_area_m2 / hot.required_area_m2).toBeCloseTo(2, 12);
  });

  it('answers the inverse questions consistently, with the fouling allowance as a k ÷ (1 + allowance)', () => {
    // Rating formula Q = k·A·ITD (common practice, docs/methods.md §3): 24 kW, k 800, 105 °C, 45 °C, 10 % → 0.55 m² (rating.ts example).
    const a = answerDesign({
      ambient_c: 45,
      heat_kw: 24,
      coolant_limit_c: 105,
      k_w_m2k: 800,
      fouling_allowance: 0.1,
      area_m2: 0.55,
    });
    expect(a.required_area_m2).toBeCloseTo(0.55, 12);
    expect(a.k_fouled_w_m2k).toBeCloseTo(800 / 1.1, 9);
    expect(a.supported_heat_kw).toBeCloseTo(24, 9);
    expect(a.supported_ambient_c).toBeCloseTo(45, 9);
    expect(a.margin_pct).toBeCloseTo(0, 9);
    const bigger = answerDesign({
      ambient_c: 45,
      heat_kw: 24,
      coolant_limit_c: 105,
      k_w_m2k: 800,
      fouling_allowance: 0.1,
      area_m2: 0.66,
    });
    expect(bigger.margin_pct).toBeCloseTo(20, 9);
    expect(bigger.supported_ambient_c).toBeCloseTo(105 - 60 / 1.2, 9);
  });

  it('refuses a design ambient at or above the limit', () => {
    expect(() =>
      answerDesign({ ambient_c: 80, heat_kw: 20, coolant_limit_c: 80, k_w_m2k: 1000, fouling_allowance: 0 }),
    ).toThrow(/must be above ambient_c/);
  });
});

describe('drivetrain heat and road load (common practice)', () => {
  it('a battery–inverter–motor chain of 0.93 each needs ≈ 25 kW in for 20 kW out and ≈ 5 kW is cooled', () => {
    const eta = chainEfficiency(0.93, 0.93, 0.93);
    expect(energyInput_kw(20, eta)).toBeCloseTo(24.86, 2);
    expect(heatToCoolant_kw(20, eta, 1 - eta)).toBeCloseTo(4.86, 2);
    expect(POWERTRAIN_PRESETS.bev.drivetrain_efficiency).toBeCloseTo(eta, 12);
  });

  it('a 0.60 stack with 0.93 battery charging and the same chain is ≈ 45 % efficient: ≈ 25 kW cooled for 20 kW', () => {
    const p = POWERTRAIN_PRESETS.fcev;
    expect(p.drivetrain_efficiency).toBeCloseTo(0.4488, 4);
    expect(heatToCoolant_kw(20, p.drivetrain_efficiency, p.coolant_heat_fraction)).toBeCloseTo(24.56, 2);
  });

  it('the one-third rule: 20 kW from an engine puts ≈ 20 kW into the coolant', () => {
    const p = POWERTRAIN_PRESETS.ice;
    expect(heatToCoolant_kw(20, p.drivetrain_efficiency, p.coolant_heat_fraction)).toBeCloseTo(20, 9);
  });

  it('drag ≈ 15 kW at 125 km/h (ρ 1.2, Cd 0.3, 2 m²) and rolling ≈ 5 kW (1500 kg, Crr 0.01)', () => {
    const r = roadLoad({ mass_kg: 1500, cda_m2: 0.3 * 2, crr: 0.01, speed_kmh: 125, air_density_kg_m3: 1.2 });
    expect(r.aero_kw).toBeCloseTo(15.07, 2); // ½·1.2·0.6·34.72³ (COMPUTED)
    expect(r.rolling_kw).toBeCloseTo(5.108, 3); // 1500·9.80665·0.01·34.72 (COMPUTED)
  });

  it('for that duty at equal k the fuel cell needs ≈ 2.5× the engine radiator, battery-electric ≈ 0.5×', () => {
    const c = compareDrivetrains(
      { mass_kg: 1500, cda_m2: 0.6, crr: 0.01, speed_kmh: 125, ambient_c: 40 },
      1000,
    );
    const row = (p: string) => c.rows.find((x) => x.powertrain === p)!;
    expect(c.wheel_kw).toBeCloseTo(20.18, 2);
    expect(row('ice').itd_k).toBe(80);
    expect(row('fcev').itd_k).toBe(40);
    expect(rel(row('ice').heat_to_coolant_kw, 20)).toBeLessThan(0.02);
    expect(rel(row('bev').heat_to_coolant_kw, 5)).toBeLessThan(0.05);
    expect(rel(row('fcev').heat_to_coolant_kw, 25)).toBeLessThan(0.02);
    expect(row('fcev').area_vs_ice).toBeCloseTo(2.456, 3); // (24.56/40)/(20/80) at any wheel power
    expect(row('bev').area_vs_ice).toBeCloseTo(0.486, 3);
    expect(rel(row('fcev').area_vs_ice, 2.5)).toBeLessThan(0.03);
    expect(rel(row('bev').area_vs_ice, 0.5)).toBeLessThan(0.03);
  });
});
