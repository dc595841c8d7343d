import { DAY_MS } from '@thermargin/shared/time';
import type { MaintenanceAction } from '@thermargin/shared';
import { foulingResistance } from '@thermargin/core/stats/kern-seaton';
import type { RadiatorCondition } from './radiator.ts';

/** Telemetry signals a sensor fault can hit. */
export type SensorSignal = 'coolant_in_c' | 'coolant_out_c' | 'ambient_c' | 'coolant_flow_lpm';

/**
 * Faults to inject, each on one vehicle. Physical faults change what the loop does; sensor faults only
 * what the telemetry says.
 */
export type FaultSpec =
  | {
      /** Asymptotic fin fouling (Kern & Seaton 1959): R_f(t) = R*·(1 − (1 − s)·e^(−t/τ)), s the share already
       *  there at `from_ms`; face velocity falls by `airflow_loss` × R_f/R*. Restarts from clean after a cleaning. */
      kind: 'fouling';
      vehicle: string;
      from_ms: number;
      r_star_m2k_w: number;
      tau_days: number;
      airflow_loss: number;
      initial_share?: number;
    }
  | {
      /** Abrupt loss of fan air flow (motor, clutch or blade damage): `remaining` of it is left, until repaired. */
      kind: 'fan_loss';
      vehicle: string;
      at_ms: number;
      remaining: number;
    }
  | {
      /** Pump wear: flow falls linearly by `loss` (share) over `ramp_days`, until the coolant is serviced. */
      kind: 'coolant_flow_loss';
      vehicle: string;
      from_ms: number;
      ramp_days: number;
      loss: number;
    }
  | { kind: 'sensor_bias'; vehicle: string; signal: SensorSignal; from_ms: number; offset: number }
  | { kind: 'sensor_stuck'; vehicle: string; signal: SensorSignal; from_ms: number; to_ms: number }
  | {
      kind: 'sensor_spikes';
      vehicle: string;
      signal: SensorSignal;
      from_ms: number;
      to_ms: number;
      per_hour: number;
      magnitude: number;
    };

export type FaultKind = FaultSpec['kind'];

/** A workshop visit: appears in the fleet file's maintenance log and ends the faults it fixes. */
export interface MaintenanceEvent {
  vehicle: string;
  at_ms: number;
  action: MaintenanceAction;
  note?: string;
}

/** Which maintenance action ends (or, for fouling, resets) which fault. */
const FIXED_BY: Record<FaultKind, MaintenanceAction> = {
  fouling: 'radiator_cleaned',
  fan_loss: 'fan_repaired',
  coolant_flow_loss: 'coolant_serviced',
  sensor_bias: 'sensor_replaced',
  sensor_stuck: 'sensor_replaced',
  sensor_spikes: 'sensor_replaced',
};

function faultStart(f: FaultSpec): number {
  return f.kind === 'fan_loss' ? f.at_ms : f.from_ms;
}

/** Epoch ms of the first maintenance that fixes `f` after it began, or +∞. */
export function fixedAt_ms(f: FaultSpec, events: readonly MaintenanceEvent[]): number {
  let best = Number.POSITIVE_INFINITY;
  for (const e of events) {
    if (e.vehicle === f.vehicle && e.action === FIXED_BY[f.kind] && e.at_ms > faultStart(f) && e.at_ms < best)
      best = e.at_ms;
  }
  return best;
}

/** Physical state of one vehicle's loop at time t from its faults and maintenance. */
export interface PhysicalCondition extends RadiatorCondition {
  /** –: coolant pump flow kept. */
  flow_factor: number;
}

export function physicalCondition(
  faults: readonly FaultSpec[],
  events: readonly MaintenanceEvent[],
  t_ms: number,
): PhysicalCondition {
  const c: PhysicalCondition = { fouling_r_m2k_w: 0, airflow_factor: 1, fan_factor: 1, flow_factor: 1 };
  for (const f of faults) {
    if (t_ms < faultStart(f)) continue;
    if (f.kind === 'fouling') {
      // each cleaning before t restarts the deposit from clean
      let since = f.from_ms;
      let share = f.initial_share ?? 0;
      for (const e of events) {
        if (
          e.vehicle === f.vehicle &&
          e.action === 'radiator_cleaned' &&
          e.at_ms > since &&
          e.at_ms <= t_ms
        ) {
          since = e.at_ms;
          share = 0;
        }
      }
      const r = foulingResistance(t_ms - since, f.r_star_m2k_w, f.tau_days * DAY_MS, share);
      c.fouling_r_m2k_w += r;
      c.airflow_factor *= 1 - f.airflow_loss * (r / f.r_star_m2k_w);
      continue;
    }
    if (t_ms >= fixedAt_ms(f, events)) continue;
    if (f.kind === 'fan_loss') c.fan_factor *= f.remaining;
    else if (f.kind === 'coolant_flow_loss')
      c.flow_factor *= 1 - f.loss * Math.min(1, (t_ms - f.from_ms) / (f.ramp_days * DAY_MS));
  }
  return c;
}

/** The sensor faults of one vehicle active at some time in [from_ms, to_ms), with their fix times resolved. */
export interface ActiveSensorFault {
  spec: Extract<FaultSpec, { signal: SensorSignal }>;
  until_ms: number;
}

export function sensorFaults(
  faults: readonly FaultSpec[],
  events: readonly MaintenanceEvent[],
): ActiveSensorFault[] {
  const out: ActiveSensorFault[] = [];
  for (const f of faults) {
    if (f.kind !== 'sensor_bias' && f.kind !== 'sensor_stuck' && f.kind !== 'sensor_spikes') continue;
    const end = f.kind === 'sensor_bias' ? Number.POSITIVE_INFINITY : f.to_ms;
    out.push({ spec: f, until_ms: Math.min(end, fixedAt_ms(f, events)) });
  }
  return out;
}
