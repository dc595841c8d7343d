/**
 * PEM fuel-cell stack heat from current and voltage (Larminie & Dicks, *Fuel Cell Systems
 * Explained*, 2nd ed., Wiley 2003): each cell turns I·E_tn of hydrogen enthalpy into I·V_cell of
 * electricity, and the rest is heat, nearly all of it into the coolant.
 */

/** C/mol: Faraday constant (CODATA 2018, exact since the 2019 SI). */
export const FARADAY_C_MOL = 96485.33212;

/** J/mol: enthalpy of formation of water vapour and liquid water, 25 °C (from memory; CODATA key values). */
const DH_LHV_J_MOL = 241.83e3;
const DH_HHV_J_MOL = 285.83e3;

/** V: thermoneutral cell voltage on a lower-heating-value basis, Δh_LHV / (2F) = 1.2532 V. */
export const E_TN_LHV_V = DH_LHV_J_MOL / (2 * FARADAY_C_MOL);

/** V: thermoneutral cell voltage on a higher-heating-value basis, Δh_HHV / (2F) = 1.4812 V. */
export const E_TN_HHV_V = DH_HHV_J_MOL / (2 * FARADAY_C_MOL);

export interface StackHeatInput {
  /** A: stack current, ≥ 0. */
  current_a: number;
  /** –: number of cells in series. */
  cells: number;
  /** V: stack terminal voltage. */
  stack_voltage_v: number;
  /** V: thermoneutral cell voltage. Default E_TN_LHV_V (water leaves as vapour). */
  thermoneutral_v?: number;
}

/**
 * kW of stack heat: I · (N · E_tn − V_stack) / 1000. Throws RangeError when the stack voltage is above
 * N · E_tn (impossible under load: wrong cell count or a bad signal).
 * Example: 300 A, 300 cells, 210 V, E_tn 1.253 V → 49.77 kW (70.29 kW with 1.481 V).
 */
export function stackHeat_kw(p: StackHeatInput): number {
  const e_tn = p.thermoneutral_v ?? E_TN_LHV_V;
  if (!(p.current_a >= 0)) throw new RangeError(`stackHeat_kw: current_a must be ≥ 0, got ${p.current_a}`);
  if (!(Number.isInteger(p.cells) && p.cells > 0)) {
    throw new RangeError(`stackHeat_kw: cells must be a positive integer, got ${p.cells}`);
  }
  const gap_v = p.cells * e_tn - p.stack_voltage_v;
  if (!(gap_v >= 0)) {
    throw new RangeError(
      `stackHeat_kw: stack_voltage_v ${p.stack_voltage_v} V is above cells · thermoneutral_v = ${p.cells * e_tn} V`,
    );
  }
  return (p.current_a * gap_v) / 1000;
}

/**
 * –: stack efficiency from the cell voltage, V_cell / E_tn (fuel utilisation taken as 1; Larminie &
 * Dicks 2003). Example: 0.70 V with E_tn 1.253 V → 0.559 (LHV basis).
 */
export function stackEfficiency(cell_voltage_v: number, thermoneutral_v = E_TN_LHV_V): number {
  if (!(cell_voltage_v > 0 && cell_voltage_v <= thermoneutral_v)) {
    throw new RangeError(
      `stackEfficiency: cell_voltage_v must be within (0, ${thermoneutral_v}], got ${cell_voltage_v}`,
    );
  }
  return cell_voltage_v / thermoneutral_v;
}
