/**
 * The "what if" replay: one trip's recorded heat pushed through a lumped loop (heat rejected = heat
 * generated − C·dT/dt, docs/methods.md §6) against the radiator's field kA at each sample's air condition,
 * at a new coolant limit and a raised ambient:
 *   C·dT/dt = Q − kA·(T − T_amb)   while the thermostat is open (T ≥ T_open), else C·dT/dt = Q;
 * each step solved exactly for Q, kA and T_amb held over the step (T → T_∞ = T_amb + Q/kA with time
 * constant C/kA), so no step size is unstable. The thermostat throttles, so a warm loop never falls
 * below T_open. Reaching the limit derates: T is held at the limit, and the heat that would have taken
 * it above, C·(T − T_limit), is heat the controller had to refuse; as traction energy that is
 * C·(T − T_limit)·η / coolant share (heat = power · share / η, drivetrain/heat.ts). The derate lasts
 * until the loop has cooled `release_k` below the limit (controllers release with hysteresis).
 */
export interface LoopParams {
  /** kJ/K: lumped thermal mass of coolant and metal. */
  thermal_mass_kj_per_k: number;
  /** °C: thermostat start-to-open. */
  thermostat_open_c: number;
  /** °C: coolant limit of the scenario. */
  coolant_limit_c: number;
  /** –: drivetrain efficiency, to turn refused heat into traction energy. */
  drivetrain_efficiency: number;
  /** –: share of the energy input that reaches the coolant. */
  coolant_heat_fraction: number;
  /** K: a derate ends once the coolant is this far below the limit. */
  release_k: number;
}

export interface ReplayStep {
  derated: boolean;
  /** kWh of traction energy not delivered in this step. */
  not_delivered_kwh: number;
}

export class LoopReplay {
  /** °C: replayed coolant temperature. */
  temp_c = Number.NaN;
  private derating = false;

  constructor(readonly p: LoopParams) {
    if (!(p.thermal_mass_kj_per_k > 0)) throw new RangeError('LoopReplay: thermal_mass_kj_per_k must be > 0');
  }

  /** Starts a trip at the recorded coolant temperature (never above the scenario's limit). */
  start(coolant_c: number): void {
    this.temp_c = Math.min(coolant_c, this.p.coolant_limit_c);
    this.derating = false;
  }

  /** Advances `dt_s` with `heat_kw` generated, radiator `ka_w_k` and air at `ambient_c`. */
  step(heat_kw: number, ka_w_k: number, ambient_c: number, dt_s: number): ReplayStep {
    const C = this.p.thermal_mass_kj_per_k;
    const open = this.p.thermostat_open_c;
    let T = this.temp_c;
    if (T < open || ka_w_k <= 0) T += (heat_kw * dt_s) / C;
    else {
      const ka_kw_k = ka_w_k / 1000;
      const Tinf = ambient_c + heat_kw / ka_kw_k;
      T = Tinf + (T - Tinf) * Math.exp((-ka_kw_k * dt_s) / C);
      if (T < open) T = open;
    }
    const limit = this.p.coolant_limit_c;
    if (T <= limit) {
      this.temp_c = T;
      this.derating &&= T > limit - this.p.release_k;
      return { derated: this.derating, not_delivered_kwh: 0 };
    }
    const refused_kj = (T - limit) * C;
    this.temp_c = limit;
    this.derating = true;
    return {
      derated: true,
      not_delivered_kwh: (refused_kj * this.p.drivetrain_efficiency) / this.p.coolant_heat_fraction / 3600,
    };
  }
}
