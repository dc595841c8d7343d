import { describe, expect, it } from 'vitest';
import { airFaceVelocity_ms } from '../../support/forward-model/airflow.ts';
import { epsilonCmaxMixed, epsilonCminMixed } from '../../support/forward-model/crossflow.ts';
import { driveTrace } from '../../support/forward-model/drive-profile.ts';
import { benchVelocityExponent } from '../../support/forward-model/fleet-config.ts';
import { AIR_CP_J_KGK, airDensity_kg_m3, coolantRhoCp_j_m3k } from '../../support/forward-model/fluids.ts';
import { simulateLoop } from '../../support/forward-model/loop.ts';
import { mulberry32, substream } from '../../support/forward-model/prng.ts';
import { CLEAN, coreK_w_m2k } from '../../support/forward-model/radiator.ts';
import { shaftPower_kw } from '../../support/forward-model/road-load.ts';
import { MODEL_STEP_S, runScenario } from '../../support/forward-model/scenario.ts';
import { HOT_TRIPS, hotMixedTrip } from '../../support/forward-model/trips.ts';
import { VEHICLES } from '../../support/forward-model/vehicles.ts';

/** Self-checks of the forward model, so a recovery miss points at the estimator, not the model. */
describe('forward model building blocks', () => {
  it('mulberry32 is deterministic', () => {
    const a = mulberry32(1);
    expect(a()).toBeCloseTo(0.6270739405881613, 15);
    expect(Array.from({ length: 5 }, substream(7, 1))).toEqual(Array.from({ length: 5 }, substream(7, 1)));
  });

  it('crossflow ε matches the closed forms of Incropera & DeWitt Table 11.3 (computed, 1e-4)', () => {
    const ntu = [0.5, 1, 2, 3, 5];
    const cmaxMixed05 = [0.3572, 0.542, 0.702, 0.7564, 0.7828];
    const cminMixed05 = [0.3575, 0.5448, 0.7175, 0.7885, 0.8405];
    const oneMixed1 = [0.3253, 0.4685, 0.5788, 0.6133, 0.6296];
    ntu.forEach((n, i) => {
      expect(epsilonCmaxMixed(n, 0.5)).toBeCloseTo(cmaxMixed05[i]!, 4);
      expect(epsilonCminMixed(n, 0.5)).toBeCloseTo(cminMixed05[i]!, 4);
      expect(epsilonCmaxMixed(n, 1)).toBeCloseTo(oneMixed1[i]!, 4);
      expect(epsilonCminMixed(n, 1)).toBeCloseTo(oneMixed1[i]!, 4);
      expect(epsilonCmaxMixed(n, 0)).toBeCloseTo(1 - Math.exp(-n), 12);
    });
  });

  it('fluid properties match Melinder (2010) at 50 vol % and the ideal-gas air of the 1976 standard atmosphere', () => {
    expect(coolantRhoCp_j_m3k(80)).toBeCloseTo(1029.2 * 3538, -1);
    expect(coolantRhoCp_j_m3k(50) / ((1056.6 * 3361 + 1043.4 * 3456) / 2)).toBeCloseTo(1, 3);
    expect(airDensity_kg_m3(40)).toBeCloseTo(1.1272, 4);
    expect(airDensity_kg_m3(15)).toBeCloseTo(1.225, 3);
  });

  it("road load matches the unit checks of Gillespie's road-load equation", () => {
    const body = {
      mass_kg: 1000,
      cda_m2: 1,
      crr: 0.01,
      driveline_efficiency: 1,
      regen_share: 0,
      rated_power_kw: 1e6,
    };
    // 612.5 W aero + 980.665 W rolling at 10 m/s, ρ 1.225.
    expect(shaftPower_kw(body, 10, 0, 0, 1.225)).toBeCloseTo(1.593165, 6);
    expect(shaftPower_kw({ ...body, crr: 0, cda_m2: 0 }, 10, 0, 0.01, 1.225)).toBeCloseTo(0.980665, 6);
  });

  it('face velocity meets the fleet file airside figures at both limits, and stays below √(ram² + fan²) between', () => {
    for (const v of VEHICLES) {
      const a = v.airflow;
      expect(airFaceVelocity_ms(a, 80, 0)).toBeCloseTo((a.ram_face_ratio * 80) / 3.6, 10);
      expect(airFaceVelocity_ms(a, 0, 100)).toBeCloseTo(a.fan_face_velocity_ms, 10);
      expect(airFaceVelocity_ms(a, 0, 80)).toBeCloseTo(0.8 * a.fan_face_velocity_ms, 10);
      const ram = (a.ram_face_ratio * 20) / 3.6;
      expect(airFaceVelocity_ms(a, 20, 100)).toBeLessThan(Math.hypot(ram, a.fan_face_velocity_ms));
    }
  });

  it('k is physical: 2–6 kW/(m²·K) at 4–7 m/s (ε_air·ρ·cp·v, computed), below ρ·cp·v, rising with air and coolant flow', () => {
    for (const v of VEHICLES) {
      const p = { flow_lpm: v.core.coolant_ref_lpm, ambient_c: 25, coolant_in_c: 80 };
      for (const u of [4, 5.5, 7]) {
        const k = coreK_w_m2k(v.core, { ...p, face_velocity_ms: u }, CLEAN);
        expect(k).toBeGreaterThan(2000);
        expect(k).toBeLessThan(6000);
        expect(k).toBeLessThan(airDensity_kg_m3(25) * AIR_CP_J_KGK * u);
        expect(coreK_w_m2k(v.core, { ...p, face_velocity_ms: u * 1.1 }, CLEAN)).toBeGreaterThan(k);
        expect(
          coreK_w_m2k(v.core, { ...p, flow_lpm: p.flow_lpm * 1.2, face_velocity_ms: u }, CLEAN),
        ).toBeGreaterThan(k);
      }
    }
  });

  it('k(v) is not a power law: the local log-log slope falls with face velocity; the fitted exponent lies in 0.4–0.8', () => {
    for (const v of VEHICLES) {
      const p = { flow_lpm: v.core.coolant_ref_lpm, ambient_c: 35, coolant_in_c: 80 };
      const slope = (u: number) =>
        Math.log(
          coreK_w_m2k(v.core, { ...p, face_velocity_ms: u * 1.05 }, CLEAN) /
            coreK_w_m2k(v.core, { ...p, face_velocity_ms: u / 1.05 }, CLEAN),
        ) / Math.log(1.05 ** 2);
      expect(slope(2.5) - slope(8)).toBeGreaterThan(0.05);
      const n = benchVelocityExponent(v);
      expect(n).toBeGreaterThan(0.4);
      expect(n).toBeLessThan(0.8);
    }
  });
});

describe('forward model loop', () => {
  it.each(VEHICLES)('$id: energy closes — ∫(heat − rejected) dt = C·ΔT to 1e-9', (v) => {
    const drive = driveTrace(hotMixedTrip(HOT_TRIPS[v.id]!), MODEL_STEP_S, substream(3, 0));
    const tr = simulateLoop(v, drive, CLEAN);
    let net_kj = 0;
    for (let i = 0; i < tr.n - 1; i++) net_kj += (tr.heat_kw[i]! - tr.rejected_kw[i]!) * tr.step_s;
    const stored_kj = v.thermal_mass_kj_per_k * (tr.coolant_c[tr.n - 1]! - tr.coolant_c[0]!);
    expect(Math.abs(net_kj - stored_kj) / stored_kj).toBeLessThan(1e-9);
  });

  it('sensors sample at the interval asked, quantise at 1 °C/bit, and leave the flow meter out when asked', () => {
    const v = VEHICLES[0]!;
    const r = runScenario({
      vehicle: v,
      profile: hotMixedTrip(HOT_TRIPS[v.id]!),
      seed: 1,
      sensors: { interval_s: 2, coolant_quantum_c: 1, flow_meter: false },
    });
    const s = r.samples;
    expect(s[1]!.time_ms - s[0]!.time_ms).toBe(2000);
    expect(s.length).toBe(Math.ceil(r.trace.n / 8));
    expect(s.every((x) => Number.isInteger(x.coolant_in_c) && Number.isInteger(x.coolant_out_c))).toBe(true);
    expect(s.every((x) => x.coolant_flow_lpm === undefined)).toBe(true);
    expect(r.config.airside?.velocity_exponent).toBeCloseTo(benchVelocityExponent(v), 12);
  });
});
