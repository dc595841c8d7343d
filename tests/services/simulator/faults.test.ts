import { describe, expect, it } from 'vitest';
import { physicalCondition } from '../../../services/simulator/src/faults.ts';
import { airsideK_w_m2k } from '../../../services/simulator/src/radiator.ts';
import { createScenario } from '../../../services/simulator/src/scenario.ts';
import type { TripTruth } from '../../../services/simulator/src/truth.ts';
import type { SimVehicle } from '../../../services/simulator/src/vehicle.ts';

const DAY = 86_400_000;
const median = (x: number[]) => {
  const s = [...x].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
};
const demo = createScenario({ days: 10, vehicles: 6 });
const vehicle = (id: string): SimVehicle => demo.vehicles.find((v) => v.id === id)!;
const kAt = (v: SimVehicle, t_ms: number, speed_kmh: number, fan_pct: number) =>
  airsideK_w_m2k(v.radiator, speed_kmh, fan_pct, physicalCondition(v.faults, v.maintenance, t_ms));

/** Truth k of the samples in a band with the thermostat fully open, before and after a time. */
function bandK(id: string, split_ms: number, inBand: (t: TripTruth, i: number) => boolean) {
  const v = vehicle(id);
  const out = { before: [] as number[], after: [] as number[] };
  for (const { truth: t } of demo.vehicleTrips(id)) {
    for (let i = 0; i < t.n; i++) {
      if (!inBand(t, i) || !(t.flow_lpm[i]! >= v.pump_lpm * 0.999) || t.coolant_c[i]! - t.ambient_c[i]! < 10)
        continue;
      (t.t0_ms + i * 1000 < split_ms ? out.before : out.after).push(t.k_w_m2k[i]!);
    }
  }
  return out;
}
const ram = (t: TripTruth, i: number) => t.speed_kmh[i]! >= 60 && t.fan_pct[i]! <= 20;
const fan = (t: TripTruth, i: number) => t.speed_kmh[i]! <= 20 && t.fan_pct[i]! >= 80;

describe('fouling', () => {
  it('lowers effective k gradually and asymptotically after a clean start, to inspect level within the history', () => {
    const v = vehicle('bus-02');
    const f = v.faults[0]!;
    const from_ms = f.kind === 'fouling' ? f.from_ms : Number.NaN;
    // clean while the bands learn their references
    expect(from_ms - demo.history.from_ms).toBeGreaterThan(
      0.35 * (demo.history.to_ms - demo.history.from_ms),
    );
    expect(kAt(v, from_ms - 1, 80, 0)).toBe(kAt(v, demo.history.from_ms, 80, 0));
    const n = Math.floor((demo.history.to_ms - from_ms) / (DAY / 2));
    const days = Array.from({ length: n + 1 }, (_, d) => from_ms + (d * DAY) / 2);
    const k = days.map((t) => kAt(v, t, 80, 0));
    const steps = k.slice(1).map((x, i) => k[i]! - x);
    for (const s of steps) expect(s).toBeGreaterThan(0); // falls every half day …
    for (let i = 1; i < steps.length; i++) expect(steps[i]!).toBeLessThan(steps[i - 1]!); // … ever less
    // margin at the end of the history below 0 % (the default inspect threshold)
    const marginEnd = (1 + v.clean_margin) * (k.at(-1)! / k[0]!) - 1;
    expect(marginEnd).toBeLessThan(0);
    expect(marginEnd).toBeGreaterThan(-0.1); // not beyond the asymptote
    // both bands lose
    expect(kAt(v, days.at(-1)!, 0, 100) / kAt(v, days[0]!, 0, 100)).toBeLessThan(0.85);
  });

  it('recovers after a cleaning, then fouls again', () => {
    const v = vehicle('bus-04');
    const cleaned = v.maintenance[0]!.at_ms;
    const before = kAt(v, cleaned - 1, 80, 0);
    const after = kAt(v, cleaned + 1, 80, 0);
    const clean = airsideK_w_m2k(v.radiator, 80, 0, { fouling_r_m2k_w: 0, airflow_factor: 1, fan_factor: 1 });
    expect(before / clean).toBeLessThan(0.9);
    expect(after / clean).toBeGreaterThan(0.999);
    expect(kAt(v, cleaned + 3 * DAY, 80, 0)).toBeLessThan(after);
  });
});

describe('fan failure', () => {
  it('lowers fan-band heat rejection and leaves the ram band alone', () => {
    const v = vehicle('bus-03');
    const f = v.faults[0]!;
    const at = f.kind === 'fan_loss' ? f.at_ms : Number.NaN;
    expect(kAt(v, at + 1, 0, 100) / kAt(v, at - 1, 0, 100)).toBeLessThan(0.6);
    expect(kAt(v, at + 1, 80, 0)).toBe(kAt(v, at - 1, 80, 0));
    // in the simulated trips (truth k = Q / (A·ITD))
    const fanK = bandK('bus-03', at, fan);
    const ramK = bandK('bus-03', at, ram);
    expect(fanK.after.length).toBeGreaterThan(100);
    expect(median(fanK.after) / median(fanK.before)).toBeLessThan(0.7);
    expect(ramK.after.length).toBeGreaterThan(100);
    expect(median(ramK.after) / median(ramK.before)).toBeGreaterThan(0.95);
  });
});

describe('coolant flow loss', () => {
  it('cuts the radiator flow and raises its temperature drop per kW', () => {
    const plan = createScenario({ days: 10, vehicles: 6 });
    const v = plan.vehicles.find((x) => x.id === 'truck-01')!;
    const early: number[] = [];
    const late: number[] = [];
    const flowEarly: number[] = [];
    const flowLate: number[] = [];
    const mid = plan.history.from_ms + 0.25 * 10 * DAY;
    const end = plan.history.from_ms + 0.7 * 10 * DAY;
    for (const { truth: t } of plan.vehicleTrips('truck-01')) {
      for (let i = 0; i < t.n; i++) {
        if (t.coolant_c[i]! < v.config.thermostat_full_open_c! || t.rejected_kw[i]! < 50) continue;
        const time = t.t0_ms + i * 1000;
        if (time < mid) {
          early.push((t.coolant_c[i]! - t.out_c[i]!) / t.rejected_kw[i]!);
          flowEarly.push(t.flow_lpm[i]!);
        } else if (time > end) {
          late.push((t.coolant_c[i]! - t.out_c[i]!) / t.rejected_kw[i]!);
          flowLate.push(t.flow_lpm[i]!);
        }
      }
    }
    expect(early.length).toBeGreaterThan(100);
    expect(late.length).toBeGreaterThan(100);
    expect(median(flowLate) / median(flowEarly)).toBeLessThan(0.75);
    expect(median(late) / median(early)).toBeGreaterThan(1.3);
  });
});

describe('sensor faults', () => {
  it('an ambient bias shows at cold starts: a soaked loop reads 6 K below ambient', () => {
    const f = vehicle('van-02').faults[0]!;
    const from = f.kind === 'sensor_bias' ? f.from_ms : Number.NaN;
    const offsets = { before: [] as number[], after: [] as number[] };
    let prevEnd = Number.NEGATIVE_INFINITY;
    let prevTrip = '';
    for (const s of demo.vehicleSamples('van-02')) {
      if (s.trip !== prevTrip && s.time_ms - prevEnd >= 6 * 3_600_000)
        (s.time_ms < from ? offsets.before : offsets.after).push(s.coolant_in_c - s.ambient_c);
      prevTrip = s.trip!;
      prevEnd = s.time_ms;
    }
    expect(offsets.before.length).toBeGreaterThanOrEqual(2);
    expect(offsets.after.length).toBeGreaterThanOrEqual(2);
    for (const o of offsets.before) expect(Math.abs(o)).toBeLessThan(1.5);
    for (const o of offsets.after) expect(o).toBeCloseTo(-6, 0);
  });

  it('a stuck sensor holds its value; spikes jump by their magnitude', () => {
    const base = createScenario({ days: 2, vehicles: 1, faults: 'none' });
    const t0 = base.history.from_ms;
    const stuckFrom = t0 + 0.5 * DAY;
    const sc = createScenario({
      days: 2,
      vehicles: 1,
      faults: {
        faults: [
          {
            kind: 'sensor_stuck',
            vehicle: 'bus-01',
            signal: 'coolant_out_c',
            from_ms: stuckFrom,
            to_ms: t0 + 1.5 * DAY,
          },
          {
            kind: 'sensor_spikes',
            vehicle: 'bus-01',
            signal: 'ambient_c',
            from_ms: t0,
            to_ms: t0 + 2 * DAY,
            per_hour: 60,
            magnitude: 20,
          },
        ],
        maintenance: [],
      },
    });
    const healthy = [...base.vehicleSamples('bus-01')];
    const faulty = [...sc.vehicleSamples('bus-01')];
    expect(faulty.length).toBe(healthy.length);
    const stuck = faulty.filter((s) => s.time_ms >= stuckFrom && s.time_ms < t0 + 1.5 * DAY);
    expect(stuck.length).toBeGreaterThan(1000);
    expect(new Set(stuck.map((s) => s.coolant_out_c)).size).toBe(1);
    let spikes = 0;
    faulty.forEach((s, i) => {
      const d = Math.abs(s.ambient_c - healthy[i]!.ambient_c);
      if (d > 1) {
        spikes++;
        expect(d).toBeCloseTo(20, 0);
      }
    });
    const hours = faulty.length / 3600;
    expect(spikes).toBeGreaterThan(0.5 * 60 * hours);
    expect(spikes).toBeLessThan(1.5 * 60 * hours);
  });
});
