import type { Powertrain } from '@thermargin/shared';
import { defaultCoolantHeatFraction } from '../vehicle/resolve.ts';
import { chainEfficiency } from './heat.ts';

/**
 * Typical figures for the three powertrains, for the simulator and the sizing calculator when a vehicle
 * has no data of its own (common practice, round numbers; not any particular vehicle):
 * - ice: the one-third rule, a third of the fuel energy each to shaft, coolant and exhaust; 120 °C limit.
 * - bev: battery, inverter and motor at 0.93 each; loop limit 80 °C (battery-electric loops 60–80 °C).
 * - fcev: stack 0.60, battery charging 0.93, then the same chain as bev; loop limit 80 °C.
 * The coolant share comes from `defaultCoolantHeatFraction`, the one place that rule lives.
 */
export interface PowertrainPreset {
  /** –: traction output / energy input, the product of `stages`. */
  drivetrain_efficiency: number;
  /** –: share of the energy input that lands in the coolant loop. */
  coolant_heat_fraction: number;
  /** °C: coolant temperature above which the controller derates. */
  coolant_limit_c: number;
  /** –: efficiency of each stage, in power-flow order. */
  stages: Readonly<Record<string, number>>;
}

function preset(
  powertrain: Powertrain,
  coolant_limit_c: number,
  stages: Record<string, number>,
): PowertrainPreset {
  const drivetrain_efficiency = chainEfficiency(...Object.values(stages));
  return Object.freeze({
    drivetrain_efficiency,
    coolant_heat_fraction: defaultCoolantHeatFraction(powertrain, drivetrain_efficiency),
    coolant_limit_c,
    stages: Object.freeze(stages),
  });
}

const BEV_CHAIN = { battery: 0.93, inverter: 0.93, motor: 0.93 };

/**
 * Named presets (common practice). Example: bev drivetrain_efficiency 0.93³ = 0.8044, fcev
 * 0.60 · 0.93⁴ = 0.4488 (≈ 45 %), ice 1/3.
 */
export const POWERTRAIN_PRESETS: Readonly<Record<Powertrain, PowertrainPreset>> = Object.freeze({
  ice: preset('ice', 120, { engine: 1 / 3 }),
  bev: preset('bev', 80, BEV_CHAIN),
  fcev: preset('fcev', 80, { stack: 0.6, battery_charge: 0.93, ...BEV_CHAIN }),
});
