import { heatToCoolant_kw } from '@thermargin/core/drivetrain/heat';
import { defaultCoolantHeatFraction } from '@thermargin/core/vehicle/resolve';
import { describe, expect, it } from 'vitest';
import { fanDuty_pct, nextDerate, thermostatOpening } from '../../../services/simulator/src/controllers.ts';
import { coolantCapacityRate_kw_k, heatRejected_kw } from '../../../services/simulator/src/radiator.ts';
import { createScenario } from '../../../services/simulator/src/scenario.ts';
import { endState } from '../../../services/simulator/src/trip-physics.ts';

const sc = createScenario({ days: 2, vehicles: 6, faults: 'none' });

describe('lumped coolant loop', () => {
  it('closes the energy balance over each trip: heat in − out − storage = 0', () => {
    // first law for the lumped loop (heat rejected = heat generated − C·dT/dt, docs/methods.md §4)
    for (const id of ['bus-01', 'truck-01', 'van-02']) {
      const v = sc.vehicles.find((x) => x.id === id)!;
      const C = v.config.thermal_mass_kj_per_k;
      for (const { truth: t } of sc.vehicleTrips(id)) {
        let inKj = 0;
        let outKj = 0;
        for (let i = 0; i < t.n; i++) {
          inKj += t.heat_kw[i]!;
          outKj += t.rejected_kw[i]!;
        }
        const storedKj = C * (endState(t, C).coolant_c - t.coolant_c[0]!);
        expect(Math.abs(inKj - outKj - storedKj)).toBeLessThan(1e-6 * inKj);
      }
    }
  });

  it('derives heat from power as the core does and rejects what the coolant side carries', () => {
    const v = sc.vehicles.find((x) => x.id === 'bus-01')!;
    const share = defaultCoolantHeatFraction(v.config.powertrain, v.config.drivetrain_efficiency);
    for (const { truth: t } of sc.vehicleTrips('bus-01')) {
      for (let i = 0; i < t.n; i += 37) {
        expect(t.heat_kw[i]).toBe(heatToCoolant_kw(t.power_kw[i]!, v.config.drivetrain_efficiency, share));
        if (t.flow_lpm[i]! > 0) {
          // ρ·cp·V̇·(T_in − T_out) = Q rejected
          const c = coolantCapacityRate_kw_k(t.flow_lpm[i]!, t.coolant_c[i]!, v.config.coolant_glycol_pct);
          expect(c * (t.coolant_c[i]! - t.out_c[i]!)).toBeCloseTo(t.rejected_kw[i]!, 9);
        } else expect(t.rejected_kw[i]).toBe(0);
      }
    }
  });

  it('opens the thermostat between its two temperatures, runs the fan and derates above the limit', () => {
    expect(thermostatOpening(50, 52, 58)).toBe(0);
    expect(thermostatOpening(55, 52, 58)).toBeCloseTo(0.5, 12);
    expect(thermostatOpening(60, 52, 58)).toBe(1);
    const fan = { fan_start_c: 62, fan_full_c: 74, fan_ac_min_pct: 85 };
    expect(fanDuty_pct(fan, 60, 50, 35)).toBe(0);
    expect(fanDuty_pct(fan, 68, 50, 35)).toBeCloseTo(50, 12);
    expect(fanDuty_pct(fan, 80, 50, 35)).toBe(100);
    expect(fanDuty_pct(fan, 60, 5, 35)).toBe(85); // condenser demand at low speed on a hot day
    expect(fanDuty_pct(fan, 60, 5, 20)).toBe(0);
    expect(nextDerate(false, 82, 82, 3)).toBe(true);
    expect(nextDerate(true, 80, 82, 3)).toBe(true); // hysteresis
    expect(nextDerate(true, 78.9, 82, 3)).toBe(false);

    // in the simulated trips: no radiator flow below opening, fan follows the ramp, derate only when hot
    const broken = { flow: 0, fan: 0, derate: 0 };
    let partOpen = 0;
    for (const v of sc.vehicles) {
      const open = v.config.thermostat_open_c;
      const limit = v.config.coolant_limit_c;
      for (const { truth: t } of sc.vehicleTrips(v.id)) {
        for (let i = 0; i < t.n; i++) {
          const T = t.coolant_c[i]!;
          if (T <= open && t.flow_lpm[i] !== 0) broken.flow++;
          if (
            T > open &&
            T < v.config.thermostat_full_open_c! &&
            t.flow_lpm[i]! > 0 &&
            t.flow_lpm[i]! < v.pump_lpm
          )
            partOpen++;
          if (T >= v.fan.fan_full_c && t.fan_pct[i] !== 100) broken.fan++;
          // the flag of sample i was set from the temperature before it
          if (t.derate[i] === 1 && t.coolant_c[Math.max(0, i - 1)]! < limit - v.archetype.derate_release_k)
            broken.derate++;
        }
      }
    }
    expect(broken).toEqual({ flow: 0, fan: 0, derate: 0 });
    expect(partOpen).toBeGreaterThan(0);
  });

  it('limits power while derated', () => {
    // a hot town and a failed fan from the start: bus-03 runs into its limit
    const probe = createScenario({ days: 2, vehicles: 3 });
    const hot = createScenario({
      days: 2,
      vehicles: 3,
      climate: { annual_mean_c: 30 },
      faults: {
        faults: [{ kind: 'fan_loss', vehicle: 'bus-03', at_ms: probe.history.from_ms, remaining: 0.2 }],
        maintenance: [],
      },
    });
    const a = hot.vehicles.find((x) => x.id === 'bus-03')!.archetype;
    let derated = 0;
    let over = 0;
    for (const { truth: t } of hot.vehicleTrips('bus-03')) {
      for (let i = 0; i < t.n; i++) {
        if (t.derate[i] !== 1) continue;
        derated++;
        const aux_kw = a.aux_base_kw + a.aux_ac_kw_per_k * (t.ambient_c[i]! - 22) + 75; // + layover charging at most
        if (t.power_kw[i]! > a.rated_kw * a.derate_power_share + aux_kw + 1e-9) over++;
      }
    }
    expect(derated).toBeGreaterThan(0);
    expect(over).toBe(0);
  });
});

describe('radiator coolant side', () => {
  it('rejects exactly kA·ITD at nominal flow, less with less flow, and the drop across the core grows', () => {
    const ka = 3.5;
    const cNom = 18;
    expect(heatRejected_kw(ka, cNom, cNom, 40)).toBeCloseTo(ka * 40, 10);
    const half = heatRejected_kw(ka, cNom, cNom / 2, 40);
    expect(half).toBeLessThan(ka * 40);
    expect(half).toBeGreaterThan(0.8 * ka * 40);
    expect(half / (cNom / 2)).toBeGreaterThan((ka * 40) / cNom); // ΔT = Q / C_c
    expect(heatRejected_kw(ka, cNom, 0, 40)).toBe(0);
    expect(heatRejected_kw(ka, cNom, cNom, -5)).toBe(0);
  });
});
