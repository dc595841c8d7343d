import type { DesignPoint, Powertrain } from '@thermargin/shared';
import type { Airflow } from './airflow.ts';
import type { Derate, FanControl, Pump, Thermostat } from './controls.ts';
import type { RadiatorCore } from './radiator.ts';
import type { Body } from './road-load.ts';

/** Everything the forward model needs to know about one vehicle's cooling loop. */
export interface VehicleSpec {
  id: string;
  powertrain: Powertrain;
  /** –: the heat contract's η and coolant share (heat = max(P, 0) · share / η). */
  drivetrain_efficiency: number;
  coolant_heat_fraction: number;
  body: Body;
  core: RadiatorCore;
  airflow: Airflow;
  /** kJ/K: lumped heat capacity of coolant and wetted metal. */
  thermal_mass_kj_per_k: number;
  thermostat: Thermostat;
  fan: FanControl;
  pump: Pump;
  coolant_limit_c: number;
  derate: Derate | null;
  design: DesignPoint;
  /** s: first-order time constant of the coolant temperature sensors. */
  sensor_lag_s: number;
  /** kW: steady heat into the loop that the traction power does not carry (pumps, power electronics,
   *  a compressor on the same loop); absent means none. */
  unmeasured_heat_kw?: number;
}
