import type { VehicleConfigInput } from '@thermargin/shared';
import { FAN_REFERENCE, faceVelocity_ms, RAM_REFERENCE } from '@thermargin/core/radiator/airside';
import type { Archetype, Range } from './archetypes.ts';
import type { FanControl } from './controllers.ts';
import type { FaultSpec, MaintenanceEvent } from './faults.ts';
import { cleanK_w_m2k, type RadiatorSpec } from './radiator.ts';
import { streamFor, type Rng } from '@thermargin/core/stats/prng';
import type { SensorFit } from './sensors.ts';

/** One simulated vehicle: the physics it is run with and the fleet-file entry that describes it. */
export interface SimVehicle {
  id: string;
  archetype: Archetype;
  /** kg: curb mass; each trip adds a payload drawn from the archetype's range. */
  mass_kg: number;
  radiator: RadiatorSpec;
  pump_lpm: number;
  fan: FanControl;
  sensors: SensorFit;
  /** The fleet-file entry, without the maintenance log (added from `maintenance` by the scenario). */
  config: VehicleConfigInput;
  faults: FaultSpec[];
  maintenance: MaintenanceEvent[];
  /** –: the clean margin at the design point this vehicle was built with. */
  clean_margin: number;
}

export interface VehicleBuild {
  id: string;
  archetype: Archetype;
  sensors: SensorFit;
  /** Put the radiator's clean bench k (ram and fan reference conditions) in the fleet file. */
  bench: boolean;
}

const draw = (r: Range, rng: Rng, digits = 0): number => {
  const x = typeof r === 'number' ? r : rng.uniform(r[0], r[1]);
  const f = 10 ** digits;
  return Math.round(x * f) / f;
};

/**
 * Draws one vehicle from its archetype (figures vary within the archetype's ranges, from the seed and
 * the id only) and sizes its radiator so that the clean margin at the design point is as drawn:
 *   kA_design = (1 + margin) · Q_design / (T_limit − T_amb,design)   (the margin of radiator/rating.ts, inverted).
 */
export function buildVehicle(b: VehicleBuild, seed: number): SimVehicle {
  const a = b.archetype;
  const rng = streamFor(seed, b.id, 'build');
  const area_m2 = draw(a.radiator_area_m2, rng, 2);
  const limit_c = draw(a.coolant_limit_c, rng);
  const heat_kw = draw(a.design.heat_kw, rng);
  const margin = draw(a.margin, rng, 2);
  const design = { ...a.design, heat_kw };
  const v_design_ms = faceVelocity_ms(design.speed_kmh, design.fan_pct, a.airside);
  const ka_w_k = ((1 + margin) * heat_kw * 1000) / (limit_c - design.ambient_c);
  const radiator: RadiatorSpec = {
    area_m2,
    airside: a.airside,
    k_design_w_m2k: ka_w_k / area_m2,
    v_design_ms,
    nominal_flow_lpm: draw(a.pump_lpm, rng),
    coolant_glycol_pct: a.coolant_glycol_pct,
  };
  const kAt = (c: { speed_kmh: number; fan_pct: number }) =>
    Math.round(cleanK_w_m2k(radiator, faceVelocity_ms(c.speed_kmh, c.fan_pct, a.airside)));
  const config: VehicleConfigInput = {
    id: b.id,
    type: a.type,
    powertrain: a.powertrain,
    drivetrain_efficiency: a.drivetrain_efficiency,
    ...(a.coolant_heat_fraction === undefined ? {} : { coolant_heat_fraction: a.coolant_heat_fraction }),
    radiator_area_m2: area_m2,
    coolant_limit_c: limit_c,
    thermostat_open_c: a.thermostat_open_c,
    thermostat_full_open_c: a.thermostat_full_open_c,
    thermal_mass_kj_per_k: draw(a.thermal_mass_kj_per_k, rng),
    coolant_glycol_pct: a.coolant_glycol_pct,
    design,
    airside: { ...a.airside },
    route_max_ambient_c: a.route_max_ambient_c,
  };
  if (b.bench) config.bench_k_w_m2k = { ram: kAt(RAM_REFERENCE), fan: kAt(FAN_REFERENCE) };
  return {
    id: b.id,
    archetype: a,
    mass_kg: draw(a.mass_kg, rng, -1),
    radiator,
    pump_lpm: radiator.nominal_flow_lpm,
    fan: { fan_start_c: a.fan_start_c, fan_full_c: a.fan_full_c, fan_ac_min_pct: a.fan_ac_min_pct },
    sensors: b.sensors,
    config,
    faults: [],
    maintenance: [],
    clean_margin: margin,
  };
}
