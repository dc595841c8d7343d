import { LoopReplay } from '@thermargin/core/sizing/replay';
import { describe, expect, it } from 'vitest';

const params = {
  thermal_mass_kj_per_k: 100,
  thermostat_open_c: 60,
  coolant_limit_c: 90,
  drivetrain_efficiency: 0.8,
  coolant_heat_fraction: 0.2,
  release_k: 2,
};

/** Runs `seconds` of constant heat through the replay in `dt_s` steps; returns derated seconds and kWh. */
function run(heat_kw: number, ka_w_k: number, amb: number, start_c: number, seconds: number, dt_s = 1) {
  const l = new LoopReplay(params);
  l.start(start_c);
  let derated_s = 0;
  let kwh = 0;
  let first: number | null = null;
  for (let t = 0; t < seconds; t += dt_s) {
    const s = l.step(heat_kw, ka_w_k, amb, dt_s);
    if (s.derated) {
      derated_s += dt_s;
      first ??= t + dt_s;
    }
    kwh += s.not_delivered_kwh;
  }
  return { derated_s, kwh, first, temp_c: l.temp_c };
}

describe('LoopReplay (lumped loop C·dT/dt = Q − kA·(T − T_amb))', () => {
  it('settles at T_amb + Q/kA below the limit without derating', () => {
    // 40 kW into 1000 W/K at 35 °C → 75 °C (steady state of the lumped model, COMPUTED).
    const r = run(40, 1000, 35, 60, 3600);
    expect(r.derated_s).toBe(0);
    expect(r.temp_c).toBeCloseTo(75, 6);
  });

  it('derates when T_∞ is above the limit, after the analytic warm-up time, and refuses the excess heat', () => {
    // T_∞ = 35 + 70/1 = 105 °C, τ = C/kA = 100 s; from 60 °C the limit 90 °C is reached at
    // t = τ·ln((105 − 60)/(105 − 90)) = 100·ln 3 = 109.9 s (COMPUTED).
    const r = run(70, 1000, 35, 60, 1000, 0.5);
    expect(r.first).toBeGreaterThanOrEqual(109.5);
    expect(r.first).toBeLessThanOrEqual(110.5);
    expect(r.derated_s).toBeCloseTo(1000 - 110, -1);
    // Held at the limit: excess heat 70 − 1·(90 − 35) = 15 kW over ≈ 890 s, as traction ×η/share = 4.
    expect(r.kwh).toBeCloseTo((15 * 890 * 4) / 3600, 0);
  });

  it('does not reject below the thermostat opening, and holds a warm loop at the opening', () => {
    const cold = run(10, 1000, 20, 30, 10);
    expect(cold.temp_c).toBeCloseTo(30 + (10 * 10) / 100, 9);
    const warm = run(5, 1000, 20, 70, 3600);
    expect(warm.temp_c).toBe(60);
  });

  it('keeps a derate on until the loop is release_k below the limit', () => {
    const l = new LoopReplay(params);
    l.start(90);
    expect(l.step(70, 1000, 35, 1).derated).toBe(true);
    // Heat off: 90 → 90 − 55·(1 − e^(−0.01)) ≈ 89.45 °C, still within 2 K: still derated, nothing refused.
    const s = l.step(0, 1000, 35, 1);
    expect(s).toEqual({ derated: true, not_delivered_kwh: 0 });
    let t = 0;
    while (l.step(0, 1000, 35, 1).derated) t++;
    expect(l.temp_c).toBeLessThanOrEqual(88);
    expect(t).toBeLessThan(10);
  });
});
