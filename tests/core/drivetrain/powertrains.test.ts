import { describe, expect, it } from 'vitest';
import { heatToCoolant_kw } from '@thermargin/core/drivetrain/heat';
import { POWERTRAIN_PRESETS } from '@thermargin/core/drivetrain/powertrains';
import { requiredArea_m2, supportedHeat_kw } from '@thermargin/core/radiator/rating';
import { defaultCoolantHeatFraction } from '@thermargin/core/vehicle/resolve';

const { ice, bev, fcev } = POWERTRAIN_PRESETS;
const coolantHeat = (p: typeof ice, out_kw: number) =>
  heatToCoolant_kw(out_kw, p.drivetrain_efficiency, p.coolant_heat_fraction);

describe('POWERTRAIN_PRESETS (common practice)', () => {
  it('doc examples: efficiencies are the products of the stages', () => {
    expect(bev.drivetrain_efficiency).toBeCloseTo(0.93 ** 3, 12);
    expect(fcev.drivetrain_efficiency).toBeCloseTo(0.6 * 0.93 ** 4, 12);
    expect(ice.drivetrain_efficiency).toBeCloseTo(1 / 3, 12);
    expect(Object.keys(fcev.stages)).toEqual(['stack', 'battery_charge', 'battery', 'inverter', 'motor']);
  });

  it('coolant shares come from the vehicle defaults (defaultCoolantHeatFraction)', () => {
    for (const [name, p] of Object.entries(POWERTRAIN_PRESETS)) {
      const powertrain = name as keyof typeof POWERTRAIN_PRESETS;
      expect(p.coolant_heat_fraction).toBe(defaultCoolantHeatFraction(powertrain, p.drivetrain_efficiency));
    }
  });

  it('common practice: 20 kW out → ≈ 20 kW cooled (ice), ≈ 5 kW (bev), ≈ 25 kW (fcev)', () => {
    expect(coolantHeat(ice, 20)).toBeCloseTo(20, 6);
    expect(coolantHeat(bev, 20)).toBeCloseTo(5, 0);
    expect(coolantHeat(fcev, 20)).toBeCloseTo(25, 0);
  });

  it('common practice: at 40 °C ambient a 120 °C limit gives ITD 80 K, an 80 °C limit 40 K: half the heat', () => {
    expect(ice.coolant_limit_c - 40).toBe(80);
    expect(fcev.coolant_limit_c - 40).toBe(40);
    const hot = supportedHeat_kw(1000, 0.5, ice.coolant_limit_c, 40);
    const cool = supportedHeat_kw(1000, 0.5, fcev.coolant_limit_c, 40);
    expect(cool / hot).toBeCloseTo(0.5, 12);
  });

  it('common practice: at equal k the fuel cell needs ≈ 2.5× the engine radiator, battery-electric ≈ 0.5×', () => {
    const area = (p: typeof ice) => requiredArea_m2(coolantHeat(p, 20), 1000, p.coolant_limit_c, 40);
    expect(area(fcev) / area(ice)).toBeCloseTo(2.5, 1);
    expect(area(bev) / area(ice)).toBeCloseTo(0.5, 1);
  });

  it('is frozen', () => {
    expect(Object.isFrozen(POWERTRAIN_PRESETS)).toBe(true);
    expect(Object.isFrozen(bev)).toBe(true);
    expect(Object.isFrozen(bev.stages)).toBe(true);
  });
});
