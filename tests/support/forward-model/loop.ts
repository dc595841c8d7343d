import { airFaceVelocity_ms } from './airflow.ts';
import { Fan, powerCap_share, pumpFlow_lpm, radiatorShare } from './controls.ts';
import type { DriveTrace } from './drive-profile.ts';
import { airDensity_kg_m3, coolantRhoCp_j_m3k } from './fluids.ts';
import { coreK_w_m2k, type Fouling } from './radiator.ts';
import { shaftPower_kw } from './road-load.ts';
import type { VehicleSpec } from './vehicle-spec.ts';

/** The true state of the loop at every integration step (what the sensors will see, before noise). */
export interface LoopTrace {
  step_s: number;
  n: number;
  speed_kmh: Float64Array;
  power_kw: Float64Array;
  heat_kw: Float64Array;
  coolant_c: Float64Array;
  coolant_out_c: Float64Array;
  /** °C: what the lagging coolant sensors read (inlet, outlet), before noise. */
  sensed_in_c: Float64Array;
  sensed_out_c: Float64Array;
  ambient_c: Float64Array;
  fan_pct: Float64Array;
  face_velocity_ms: Float64Array;
  radiator_flow_lpm: Float64Array;
  rejected_kw: Float64Array;
  derate: Float64Array;
}

const FIELDS = [
  'speed_kmh',
  'power_kw',
  'heat_kw',
  'coolant_c',
  'coolant_out_c',
  'sensed_in_c',
  'sensed_out_c',
  'ambient_c',
  'fan_pct',
  'face_velocity_ms',
  'radiator_flow_lpm',
  'rejected_kw',
  'derate',
] as const;

/**
 * Integrates the lumped loop C·dT/dt = Q_generated − Q_radiator (explicit Euler at the drive trace's
 * step, ≤ 0.25 s against loop time constants of minutes). The radiator sees the thermostat's share of
 * the pump flow and rejects k·A·(T − T_ambient) with k from ε-NTU. The heat generated is the
 * traction heat plus the vehicle's unmeasured steady heat (heat_kw holds both). Starts from `start_c` (a cold soak
 * starts at ambient).
 */
export function simulateLoop(
  v: VehicleSpec,
  drive: DriveTrace,
  fouling: Fouling,
  start_c?: number,
): LoopTrace {
  const n = drive.n;
  const dt = drive.step_s;
  const tr = { step_s: dt, n } as LoopTrace;
  for (const f of FIELDS) tr[f] = new Float64Array(n);
  const fan = new Fan(v.fan);
  const C_kj_k = v.thermal_mass_kj_per_k;
  const unmeasured_kw = v.unmeasured_heat_kw ?? 0;
  const lag = Math.min(1, dt / v.sensor_lag_s);
  let T = start_c ?? drive.ambient_c[0]!;
  let sIn = T;
  let sOut = T;
  for (let i = 0; i < n; i++) {
    const amb = drive.ambient_c[i]!;
    const speed_ms = drive.speed_ms[i]!;
    const demand_kw =
      shaftPower_kw(v.body, speed_ms, drive.accel_ms2[i]!, drive.grade[i]!, airDensity_kg_m3(amb)) +
      drive.aux_kw[i]!;
    const cap = powerCap_share(v.derate, T, v.coolant_limit_c);
    const power_kw = Math.min(demand_kw, cap * v.body.rated_power_kw);
    const heat_kw =
      (Math.max(0, power_kw) * v.coolant_heat_fraction) / v.drivetrain_efficiency + unmeasured_kw;
    const fan_pct = fan.step(T, dt);
    const flow_lpm =
      radiatorShare(v.thermostat, T) * pumpFlow_lpm(v.pump, speed_ms, demand_kw / v.body.rated_power_kw);
    const face_ms = airFaceVelocity_ms(v.airflow, speed_ms * 3.6, fan_pct);
    const k = coreK_w_m2k(
      v.core,
      { face_velocity_ms: face_ms, flow_lpm, ambient_c: amb, coolant_in_c: T },
      fouling,
    );
    const rejected_kw = (k * v.core.area_m2 * (T - amb)) / 1000;
    const Tout = flow_lpm > 0 ? T - (rejected_kw * 1000 * 60_000) / (coolantRhoCp_j_m3k(T) * flow_lpm) : amb;
    sIn += (T - sIn) * lag;
    sOut += (Tout - sOut) * lag;
    tr.speed_kmh[i] = speed_ms * 3.6;
    tr.power_kw[i] = power_kw;
    tr.heat_kw[i] = heat_kw;
    tr.coolant_c[i] = T;
    tr.coolant_out_c[i] = Tout;
    tr.sensed_in_c[i] = sIn;
    tr.sensed_out_c[i] = sOut;
    tr.ambient_c[i] = amb;
    tr.fan_pct[i] = fan_pct;
    tr.face_velocity_ms[i] = face_ms;
    tr.radiator_flow_lpm[i] = flow_lpm;
    tr.rejected_kw[i] = rejected_kw;
    tr.derate[i] = cap < 1 ? 1 : 0;
    T += ((heat_kw - rejected_kw) / C_kj_k) * dt;
  }
  return tr;
}
