import type { Sample } from '@thermargin/shared';
import type { ActiveSensorFault, SensorSignal } from './faults.ts';
import type { Rng } from '@thermargin/core/stats/prng';
import type { TripTruth } from './truth.ts';

/** Which optional sensors a vehicle carries. */
export interface SensorFit {
  outlet: boolean;
  flow: boolean;
}

/** Noise of healthy sensors (standard deviations; from memory, high-resolution J1939-class signals). */
export const SENSOR_NOISE = Object.freeze({
  /** K: coolant and ambient thermistors. */
  temperature_k: 0.1,
  /** km/h: wheel-speed signal while moving. */
  speed_kmh: 0.1,
  /** –: relative error of the power estimate the controller reports. */
  power_rel: 0.01,
  /** –: relative error of a flow meter. */
  flow_rel: 0.01,
});

/** Rounded to 1/f; + 0 turns −0 into 0, so the text form reads back as the same value. */
const round = (x: number, f: number) => Math.round(x * f) / f + 0;

/**
 * Steps per unit of the demo's sensors: the SAE J1939-71 resolutions its loggers send (temperatures
 * 0.03125 °C as SPN 1637 and 171, speed 1/256 km/h as SPN 84, fan 0.4 % as SPN 975) and 0.1 for power and
 * flow, so its CSV and its J1939 frames carry the very same values.
 */
export const SENSOR_STEPS = Object.freeze({ temperature: 32, speed: 256, fan: 2.5, power: 10, flow: 10 });

/**
 * Turns the truth into telemetry for one vehicle: noise, then sensor faults (bias, stuck at the last
 * good value, spikes). Holds the stuck values across trips, so keep one per vehicle stream.
 */
export class SensorSuite {
  private readonly stuck = new Map<ActiveSensorFault, number>();
  private readonly last: Partial<Record<SensorSignal, number>> = {};

  constructor(
    readonly vehicle: string,
    readonly fit: SensorFit,
    readonly faults: readonly ActiveSensorFault[],
  ) {}

  private apply(signal: SensorSignal, value: number, t_ms: number, rng: Rng): number {
    let v = value;
    for (const f of this.faults) {
      const s = f.spec;
      if (s.signal !== signal || t_ms < s.from_ms || t_ms >= f.until_ms) continue;
      if (s.kind === 'sensor_bias') v += s.offset;
      else if (s.kind === 'sensor_spikes') {
        if (rng.chance(s.per_hour / 3600)) v += rng.chance(0.5) ? s.magnitude : -s.magnitude;
      } else {
        if (!this.stuck.has(f)) this.stuck.set(f, this.last[signal] ?? v);
        v = this.stuck.get(f)!;
      }
    }
    this.last[signal] = value;
    return v;
  }

  private temp(signal: SensorSignal, truth: number, t_ms: number, rng: Rng): number {
    const v = this.apply(signal, truth + SENSOR_NOISE.temperature_k * rng.normal(), t_ms, rng);
    return round(v, SENSOR_STEPS.temperature);
  }

  /** The telemetry sample for truth index i. */
  sample(tr: TripTruth, i: number, trip: string, rng: Rng): Sample {
    const t = tr.t0_ms + i * 1000;
    const speed = tr.speed_kmh[i]!;
    const s: Sample = {
      time_ms: t,
      vehicle: this.vehicle,
      trip,
      speed_kmh:
        speed > 0.05
          ? round(Math.max(0, speed + SENSOR_NOISE.speed_kmh * rng.normal()), SENSOR_STEPS.speed)
          : 0,
      power_kw: round(tr.power_kw[i]! * (1 + SENSOR_NOISE.power_rel * rng.normal()), SENSOR_STEPS.power),
      coolant_in_c: this.temp('coolant_in_c', tr.coolant_c[i]!, t, rng),
      ambient_c: this.temp('ambient_c', tr.ambient_c[i]!, t, rng),
      fan_pct: round(tr.fan_pct[i]!, SENSOR_STEPS.fan),
      derate: tr.derate[i]!,
    };
    if (this.fit.outlet) s.coolant_out_c = this.temp('coolant_out_c', tr.out_c[i]!, t, rng);
    if (this.fit.flow) {
      const flow = tr.flow_lpm[i]! * (1 + SENSOR_NOISE.flow_rel * rng.normal());
      s.coolant_flow_lpm = round(
        Math.max(0, this.apply('coolant_flow_lpm', flow, t, rng)),
        SENSOR_STEPS.flow,
      );
    }
    return s;
  }
}
