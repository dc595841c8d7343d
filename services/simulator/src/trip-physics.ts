import { heatToCoolant_kw } from '@thermargin/core/drivetrain/heat';
import { roadLoad } from '@thermargin/core/drivetrain/road-load';
import { dryAirDensity_kg_m3 } from '@thermargin/core/properties/air';
import { defaultCoolantHeatFraction } from '@thermargin/core/vehicle/resolve';
import type { Climate } from './climate.ts';
import { fanDuty_pct, nextDerate, thermostatOpening } from './controllers.ts';
import type { Drive } from './cycles.ts';
import { physicalCondition } from './faults.ts';
import { airsideK_w_m2k, coolantCapacityRate_kw_k, heatRejected_kw } from './radiator.ts';
import { emptyTruth, type TripTruth } from './truth.ts';
import type { SimVehicle } from './vehicle.ts';

/** Loop temperatures carried from one trip to the next (through the soak). */
export interface LoopState {
  coolant_c: number;
  out_c: number;
  /** epoch ms the state refers to. */
  at_ms: number;
}

/** °C: ambient above which the air conditioning loads the auxiliaries (aux_ac_kw_per_k counts above it). */
const AC_BASE_C = 22;
/** m/s²: hardest braking the driver model uses. */
const MAX_BRAKE_MS2 = 1.5;
/** s: time constant of a stagnant radiator's outlet sensor drifting to ambient while no coolant flows. */
const STAGNANT_TAU_S = 600;

/**
 * The parked loop cooling to ambient: Newton cooling with the vehicle's soak time constant, toward the
 * ambient at the end of the stop. Example: τ 2 h, 6 h stop → 5 % of the start difference left.
 */
export function soak(state: LoopState, to_ms: number, ambient_c: number, tau_h: number): LoopState {
  const f = Math.exp(-(to_ms - state.at_ms) / (tau_h * 3_600_000));
  return {
    coolant_c: ambient_c + (state.coolant_c - ambient_c) * f,
    out_c: ambient_c + (state.out_c - ambient_c) * f,
    at_ms: to_ms,
  };
}

/**
 * Runs one trip at 1 Hz: driver and road load (core road-load), heat into the coolant (core
 * heatToCoolant_kw), thermostat, fan and derate, radiator (radiator.ts) and the lumped loop
 *   C · dT/dt = heat − rejected   (explicit Euler, 1 s; C from the fleet file's thermal mass).
 * Faults are taken at the trip's start: they change over days, not within a trip.
 */
export function runTrip(
  v: SimVehicle,
  drive: Drive,
  payload_kg: number,
  start: LoopState,
  climate: Climate,
): TripTruth {
  const a = v.archetype;
  const cfg = v.config;
  const cond = physicalCondition(v.faults, v.maintenance, start.at_ms);
  const mass_kg = v.mass_kg + payload_kg;
  const eta = cfg.drivetrain_efficiency;
  const share = cfg.coolant_heat_fraction ?? defaultCoolantHeatFraction(cfg.powertrain, eta);
  const C_kj_k = cfg.thermal_mass_kj_per_k;
  const fullOpen_c = cfg.thermostat_full_open_c ?? cfg.thermostat_open_c;
  const area = v.radiator.area_m2;
  const stagnant = Math.exp(-1 / STAGNANT_TAU_S);
  const tr = emptyTruth(drive.n, start.at_ms);
  let T = start.coolant_c;
  let Tout = start.out_c;
  let speed_ms = 0;
  let derated = false;
  let amb = 0;
  let rho = 0;
  for (let i = 0; i < drive.n; i++) {
    // ambient changes by a few hundredths of a kelvin a minute: evaluated once a minute
    if (i % 60 === 0) {
      amb = climate(start.at_ms + i * 1000);
      rho = dryAirDensity_kg_m3(amb);
    }
    let accel = Math.max(-MAX_BRAKE_MS2, Math.min(a.accel_ms2, drive.speed_kmh[i]! / 3.6 - speed_ms));
    const mid_ms = Math.max(0, speed_ms + accel / 2);
    const rl = roadLoad({
      mass_kg,
      cda_m2: a.cda_m2,
      crr: a.crr,
      speed_kmh: mid_ms * 3.6,
      grade_pct: drive.grade_pct[i]!,
      accel_ms2: accel,
      air_density_kg_m3: rho,
    });
    let wheel_kw = rl.wheel_kw;
    const cap_kw = a.rated_kw * (derated ? a.derate_power_share : 1);
    if (wheel_kw > cap_kw) {
      // not enough power: the vehicle accelerates less (or slows on the grade)
      accel -= ((wheel_kw - cap_kw) * 1000) / (mass_kg * Math.max(mid_ms, 1));
      wheel_kw = cap_kw;
    }
    const traction_kw = wheel_kw >= 0 ? wheel_kw : Math.max(wheel_kw * a.regen_share, a.min_power_kw);
    const power_kw =
      traction_kw + a.aux_base_kw + a.aux_ac_kw_per_k * Math.max(0, amb - AC_BASE_C) + drive.aux_kw[i]!;
    const heat_kw = heatToCoolant_kw(power_kw, eta, share);
    const speed_kmh = speed_ms * 3.6;
    const fan_pct = fanDuty_pct(v.fan, T, speed_kmh, amb);
    const flow_lpm = thermostatOpening(T, cfg.thermostat_open_c, fullOpen_c) * v.pump_lpm * cond.flow_factor;
    const rhoCp = coolantCapacityRate_kw_k(1, T, v.radiator.coolant_glycol_pct);
    const c_kw_k = rhoCp * flow_lpm;
    const ka_kw_k = (airsideK_w_m2k(v.radiator, speed_kmh, fan_pct, cond) * area) / 1000;
    const rejected_kw = heatRejected_kw(ka_kw_k, rhoCp * v.radiator.nominal_flow_lpm, c_kw_k, T - amb);
    Tout = c_kw_k > 0 ? T - rejected_kw / c_kw_k : amb + (Tout - amb) * stagnant;

    tr.speed_kmh[i] = speed_kmh;
    tr.power_kw[i] = power_kw;
    tr.heat_kw[i] = heat_kw;
    tr.rejected_kw[i] = rejected_kw;
    tr.coolant_c[i] = T;
    tr.out_c[i] = Tout;
    tr.ambient_c[i] = amb;
    tr.fan_pct[i] = fan_pct;
    tr.flow_lpm[i] = flow_lpm;
    tr.derate[i] = derated ? 1 : 0;
    tr.k_w_m2k[i] = flow_lpm > 0 && T > amb ? (rejected_kw * 1000) / (area * (T - amb)) : Number.NaN;

    derated = nextDerate(derated, T, cfg.coolant_limit_c, a.derate_release_k);
    T += (heat_kw - rejected_kw) / C_kj_k;
    speed_ms = Math.max(0, speed_ms + accel);
  }
  return tr;
}

/** The loop state after the last sample of a trip (one more Euler step past it). */
export function endState(tr: TripTruth, C_kj_k: number): LoopState {
  const i = tr.n - 1;
  return {
    coolant_c: tr.coolant_c[i]! + (tr.heat_kw[i]! - tr.rejected_kw[i]!) / C_kj_k,
    out_c: tr.out_c[i]!,
    at_ms: tr.t0_ms + tr.n * 1000,
  };
}
