/**
 * Heat into the coolant loop from traction power, without a coolant flow meter (docs/methods.md §2):
 * energy input = output / η, and a share of that input lands in the coolant.
 */

function checkFraction(fn: string, name: string, value: number): void {
  if (!(value > 0 && value <= 1)) throw new RangeError(`${fn}: ${name} must be within (0, 1], got ${value}`);
}

/**
 * kW: energy input needed for `output_kw` through a chain of efficiency `efficiency` (η = out / in).
 * Example: 20 kW out at η 0.804357 (0.93³) → 24.86 kW in.
 */
export function energyInput_kw(output_kw: number, efficiency: number): number {
  checkFraction('energyInput_kw', 'efficiency', efficiency);
  return output_kw / efficiency;
}

/**
 * kW into the coolant: max(power, 0) · coolant_heat_fraction / drivetrain_efficiency, the fraction
 * being the share of the energy *input* the loop receives. Regeneration (power < 0) adds no engine or
 * stack heat, so it counts as zero. Example: 20 kW, one-third rule (η 1/3, fraction 1/3) → 20 kW.
 */
export function heatToCoolant_kw(
  power_kw: number,
  drivetrain_efficiency: number,
  coolant_heat_fraction: number,
): number {
  checkFraction('heatToCoolant_kw', 'drivetrain_efficiency', drivetrain_efficiency);
  if (!(coolant_heat_fraction >= 0 && coolant_heat_fraction <= 1)) {
    throw new RangeError(
      `heatToCoolant_kw: coolant_heat_fraction must be within 0…1, got ${coolant_heat_fraction}`,
    );
  }
  if (Number.isNaN(power_kw)) throw new RangeError('heatToCoolant_kw: power_kw is NaN');
  return (Math.max(power_kw, 0) * coolant_heat_fraction) / drivetrain_efficiency;
}

/**
 * –: efficiency of stages in series, the product of each stage's efficiency (each within (0, 1]).
 * Example: chainEfficiency(0.93, 0.93, 0.93) = 0.804357.
 */
export function chainEfficiency(...stages: number[]): number {
  if (stages.length === 0) throw new RangeError('chainEfficiency: needs at least one stage');
  let eta = 1;
  stages.forEach((s, i) => {
    checkFraction('chainEfficiency', `stage ${i}`, s);
    eta *= s;
  });
  return eta;
}
