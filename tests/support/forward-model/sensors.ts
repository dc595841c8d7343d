import type { Sample } from '@thermargin/shared';
import type { LoopTrace } from './loop.ts';
import { gaussian, type Rng } from './prng.ts';

/**
 * How the telemetry unit reads the loop: sampling interval, white noise, quantisation (SAE J1939
 * resolutions of SAE J1939-71: SPN 110 at 1 °C, SPN 1637 at 0.03125 °C per bit) and which optional
 * sensors are fitted.
 */
export interface SensorSpec {
  interval_s: number;
  /** K, 1σ: coolant inlet and outlet temperature noise. */
  coolant_noise_k: number;
  /** K, 1σ: ambient temperature noise. */
  ambient_noise_k: number;
  /** K: steady offset of the ambient sensor (reads true + offset; a sensor in the engine bay's heat). */
  ambient_offset_k: number;
  /** –, 1σ: relative noise of power (and of the flow meter). */
  power_noise_share: number;
  flow_noise_share: number;
  /** °C per bit of the coolant temperatures: 0.03125 (SPN 1637) or 1 (SPN 110); 0 = unquantised. */
  coolant_quantum_c: number;
  outlet_sensor: boolean;
  flow_meter: boolean;
}

export const SENSOR_DEFAULTS: Readonly<SensorSpec> = Object.freeze({
  interval_s: 1,
  coolant_noise_k: 0.2,
  ambient_noise_k: 0.1,
  ambient_offset_k: 0,
  power_noise_share: 0.01,
  flow_noise_share: 0.01,
  coolant_quantum_c: 0,
  outlet_sensor: true,
  flow_meter: true,
});

/** SAE J1939 resolutions of the other signals: SPN 84 speed, SPN 171 ambient, SPN 975 fan. */
const SPEED_QUANTUM_KMH = 1 / 256;
const AMBIENT_QUANTUM_C = 0.03125;
const FAN_QUANTUM_PCT = 0.4;

function quantise(x: number, q: number): number {
  return q > 0 ? Math.round(x / q) * q : x;
}

export interface SampleIds {
  vehicle: string;
  trip: string;
  start_ms: number;
}

/** Telemetry samples from a loop trace; `rng` drives all the noise. */
export function readSensors(tr: LoopTrace, s: SensorSpec, ids: SampleIds, rng: Rng): Sample[] {
  const every = Math.round(s.interval_s / tr.step_s);
  if (Math.abs(every * tr.step_s - s.interval_s) > 1e-9) {
    throw new Error(
      `readSensors: interval ${s.interval_s} s is not a multiple of the model step ${tr.step_s} s`,
    );
  }
  const out: Sample[] = [];
  const temp = (x: number) => quantise(x + s.coolant_noise_k * gaussian(rng), s.coolant_quantum_c);
  for (let i = 0; i < tr.n; i += every) {
    const sample: Sample = {
      time_ms: ids.start_ms + Math.round(i * tr.step_s * 1000),
      vehicle: ids.vehicle,
      trip: ids.trip,
      speed_kmh: quantise(Math.max(0, tr.speed_kmh[i]!), SPEED_QUANTUM_KMH),
      power_kw: tr.power_kw[i]! * (1 + s.power_noise_share * gaussian(rng)),
      coolant_in_c: temp(tr.sensed_in_c[i]!),
      ambient_c: quantise(
        tr.ambient_c[i]! + s.ambient_offset_k + s.ambient_noise_k * gaussian(rng),
        AMBIENT_QUANTUM_C,
      ),
      fan_pct: quantise(tr.fan_pct[i]!, FAN_QUANTUM_PCT),
      derate: tr.derate[i]!,
    };
    if (s.outlet_sensor) sample.coolant_out_c = temp(tr.sensed_out_c[i]!);
    if (s.flow_meter)
      sample.coolant_flow_lpm = tr.radiator_flow_lpm[i]! * (1 + s.flow_noise_share * gaussian(rng));
    out.push(sample);
  }
  return out;
}
