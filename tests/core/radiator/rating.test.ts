import { describe, expect, it } from 'vitest';
import {
  itd_k,
  limitingAmbient_c,
  marginPct,
  ratedHeat_kw,
  requiredArea_m2,
  supportedAmbient_c,
  supportedHeat_kw,
} from '@thermargin/core/radiator/rating';

describe('simplified rating formula Q = k · A_net · ITD (common practice)', () => {
  it('doc examples (worked numbers)', () => {
    expect(itd_k(95, 30)).toBe(65);
    expect(ratedHeat_kw(1000, 0.5, 65)).toBeCloseTo(32.5, 12);
    expect(marginPct(450, 105, 45, 24)).toBeCloseTo(12.5, 10);
    expect(limitingAmbient_c(450, 105, 24)).toBeCloseTo(51.6667, 4);
    expect(requiredArea_m2(24, 800, 105, 45, 0.1)).toBeCloseTo(0.55, 12);
    expect(supportedHeat_kw(800, 0.5, 105, 45)).toBeCloseTo(24, 12);
    expect(supportedAmbient_c(800, 0.5, 105, 24)).toBeCloseTo(45, 12);
  });

  it('W and kW: k 1 W/(m²·K) on 1 m² at 1 K is 0.001 kW', () => {
    expect(ratedHeat_kw(1, 1, 1)).toBe(0.001);
  });

  it('margin 0 ⇔ LAT equals the design ambient', () => {
    const ka = 400;
    const heat = supportedHeat_kw(800, 0.5, 105, 45);
    expect(marginPct(ka, 105, 45, heat)).toBeCloseTo(0, 10);
    expect(limitingAmbient_c(ka, 105, heat)).toBeCloseTo(45, 10);
  });

  it('margin sign follows LAT against the design ambient', () => {
    for (const heat of [10, 20, 24, 30, 40]) {
      const margin = marginPct(400, 105, 45, heat);
      const lat = limitingAmbient_c(400, 105, heat);
      expect(Math.sign(Math.round(margin * 1e9))).toBe(Math.sign(Math.round((lat - 45) * 1e9)));
    }
  });

  it('the inverses agree: Q(A_req) = Q_design, LAT(A_req) = design ambient; the fouling allowance scales area', () => {
    const a = requiredArea_m2(30, 900, 80, 40);
    expect(supportedHeat_kw(900, a, 80, 40)).toBeCloseTo(30, 10);
    expect(supportedAmbient_c(900, a, 80, 30)).toBeCloseTo(40, 10);
    expect(requiredArea_m2(30, 900, 80, 40, 0.15)).toBeCloseTo(a * 1.15, 12);
  });

  it('common practice: halving the ITD halves the heat a radiator rejects and doubles the area needed', () => {
    expect(supportedHeat_kw(1000, 0.5, 80, 40) / supportedHeat_kw(1000, 0.5, 120, 40)).toBeCloseTo(0.5, 12);
    expect(requiredArea_m2(20, 1000, 80, 40) / requiredArea_m2(20, 1000, 120, 40)).toBeCloseTo(2, 12);
  });

  it('rejects bad input naming the function and field', () => {
    expect(() => ratedHeat_kw(0, 1, 10)).toThrow(/ratedHeat_kw: k_w_m2k must be finite and > 0/);
    expect(() => marginPct(400, 105, 45, 0)).toThrow(/marginPct: heat_kw/);
    expect(() => limitingAmbient_c(-1, 105, 20)).toThrow(/limitingAmbient_c: ka_w_k/);
    expect(() => limitingAmbient_c(400, 105, -1)).toThrow(/heat_kw must be finite and ≥ 0/);
    expect(() => requiredArea_m2(20, 800, 40, 45)).toThrow(
      /requiredArea_m2: coolant_limit_c \(40 °C\) must be above/,
    );
    expect(() => requiredArea_m2(20, 800, 105, 45, -0.1)).toThrow(/fouling_allowance/);
    expect(() => supportedHeat_kw(800, 0, 105, 45)).toThrow(/supportedHeat_kw: area_m2/);
    expect(() => supportedAmbient_c(800, 0.5, 105, Number.NaN)).toThrow(RangeError);
    expect(() => itd_k(Number.NaN, 20)).toThrow(/itd_k: coolant_in_c/);
  });
});
