import type { Powertrain } from '@thermargin/shared';
import { energyInput_kw, heatToCoolant_kw } from '../drivetrain/heat.ts';
import { POWERTRAIN_PRESETS, type PowertrainPreset } from '../drivetrain/powertrains.ts';
import { type RoadLoadInput, roadLoad } from '../drivetrain/road-load.ts';
import { requiredArea_m2 } from '../radiator/rating.ts';

/** A duty to compare drivetrains on: a road-load point and the hottest-day ambient. */
export interface Duty extends RoadLoadInput {
  /** °C: design ambient. */
  ambient_c: number;
}

export interface DrivetrainRow {
  powertrain: Powertrain;
  drivetrain_efficiency: number;
  /** kW drawn from fuel, hydrogen or battery for the wheel power. */
  energy_input_kw: number;
  heat_to_coolant_kw: number;
  coolant_limit_c: number;
  /** K: coolant limit − design ambient, the ITD the loop allows. */
  itd_k: number;
  /** m² at the given k and allowance (equal k for all: the comparison is of heat and ITD). */
  required_area_m2: number;
  /** –: required area ÷ the engine's. */
  area_vs_ice: number;
}

/** Where a figure of the comparison's duty came from: the caller, the fleet's own data, or DEFAULT_DUTY. */
export type DutySource = 'given' | 'fleet_data' | 'default';
export const DUTY_FIGURES = ['mass_kg', 'cda_m2', 'crr', 'speed_kmh', 'ambient_c'] as const;

export interface DrivetrainComparison {
  duty: Duty;
  /** Per figure of the duty, where it came from, and how the fleet's figures were read (sizing only). */
  duty_source?: Record<(typeof DUTY_FIGURES)[number], DutySource>;
  duty_note?: string;
  aero_kw: number;
  rolling_kw: number;
  wheel_kw: number;
  k_w_m2k: number;
  fouling_allowance: number;
  rows: DrivetrainRow[];
}

/**
 * The same duty on an engine, a battery-electric and a fuel-cell drivetrain: wheel power from the
 * road-load equation, heat to the coolant from each preset's efficiency and coolant share, and the
 * area each needs at its own coolant limit (drivetrain/powertrains.ts, common practice figures).
 * Example: 1500 kg, CdA 0.6, Crr 0.01, 125 km/h, 40 °C → wheel 20.2 kW; engine ≈ 20 kW to coolant at
 * 80 K, fuel cell ≈ 25 kW at 40 K: ≈ 2.5× the area; battery-electric ≈ 5 kW: ≈ 0.5×.
 */
export function compareDrivetrains(
  duty: Duty,
  k_w_m2k: number,
  fouling_allowance = 0,
  presets: Readonly<Record<Powertrain, PowertrainPreset>> = POWERTRAIN_PRESETS,
): DrivetrainComparison {
  const load = roadLoad(duty);
  if (!(load.wheel_kw > 0))
    throw new RangeError(`compareDrivetrains: the duty needs positive wheel power, got ${load.wheel_kw} kW`);
  const order: Powertrain[] = ['ice', 'bev', 'fcev'];
  const base = order.map((powertrain) => {
    const p = presets[powertrain];
    const heat = heatToCoolant_kw(load.wheel_kw, p.drivetrain_efficiency, p.coolant_heat_fraction);
    return {
      powertrain,
      drivetrain_efficiency: p.drivetrain_efficiency,
      energy_input_kw: energyInput_kw(load.wheel_kw, p.drivetrain_efficiency),
      heat_to_coolant_kw: heat,
      coolant_limit_c: p.coolant_limit_c,
      itd_k: p.coolant_limit_c - duty.ambient_c,
      required_area_m2: requiredArea_m2(heat, k_w_m2k, p.coolant_limit_c, duty.ambient_c, fouling_allowance),
    };
  });
  const ice = base[0]!.required_area_m2;
  return {
    duty,
    aero_kw: load.aero_kw,
    rolling_kw: load.rolling_kw,
    wheel_kw: load.wheel_kw,
    k_w_m2k,
    fouling_allowance,
    rows: base.map((b) => ({ ...b, area_vs_ice: b.required_area_m2 / ice })),
  };
}
