/**
 * The loop's actuators: thermostat/bypass valve, fan controller, coolant pump and power derate.
 */

/** Wax thermostat: the radiator's share of the pump flow rises linearly from open to full open. */
export interface Thermostat {
  open_c: number;
  full_open_c: number;
  /** –: share through the radiator with the valve shut (bleed hole). */
  leak_share: number;
}

export function radiatorShare(t: Thermostat, coolant_c: number): number {
  const x = Math.min(1, Math.max(0, (coolant_c - t.open_c) / (t.full_open_c - t.open_c)));
  return t.leak_share + (1 - t.leak_share) * x;
}

/**
 * Fan controller: off until `on_c`, then `min_pct` rising linearly to 100 % at `full_c`; it switches
 * off only below on_c − hysteresis_k, and the fan speed follows the demand at a limited slew rate.
 */
export interface FanControl {
  on_c: number;
  full_c: number;
  min_pct: number;
  hysteresis_k: number;
  slew_pct_s: number;
}

export class Fan {
  duty_pct = 0;
  private on = false;

  constructor(private readonly c: FanControl) {}

  step(coolant_c: number, dt_s: number): number {
    if (coolant_c >= this.c.on_c) this.on = true;
    else if (coolant_c < this.c.on_c - this.c.hysteresis_k) this.on = false;
    const ramp = (coolant_c - this.c.on_c) / (this.c.full_c - this.c.on_c);
    const demand = this.on
      ? Math.min(100, Math.max(this.c.min_pct, this.c.min_pct + (100 - this.c.min_pct) * ramp))
      : 0;
    const maxStep = this.c.slew_pct_s * dt_s;
    this.duty_pct += Math.max(-maxStep, Math.min(maxStep, demand - this.duty_pct));
    return this.duty_pct;
  }
}

/** Electric pump at a fixed flow, or an engine-driven one whose flow follows engine speed. */
export type Pump =
  | { kind: 'electric'; flow_lpm: number }
  | { kind: 'engine'; flow_at_rated_lpm: number; idle_rpm: number; rated_rpm: number };

/**
 * rpm of a combustion engine from road speed and load: idle at a standstill, otherwise rising with
 * load between idle and rated (a driver in a sensible gear).
 */
export function engineSpeed_rpm(
  p: Extract<Pump, { kind: 'engine' }>,
  speed_ms: number,
  load_share: number,
): number {
  if (speed_ms < 0.3) return p.idle_rpm;
  return p.idle_rpm + (p.rated_rpm - p.idle_rpm) * Math.min(1, 0.4 + 0.6 * Math.max(0, load_share));
}

export function pumpFlow_lpm(p: Pump, speed_ms: number, load_share: number): number {
  if (p.kind === 'electric') return p.flow_lpm;
  return (p.flow_at_rated_lpm * engineSpeed_rpm(p, speed_ms, load_share)) / p.rated_rpm;
}

/** Controller derate: power limited linearly from 100 % at the limit to `floor_share` at limit + span. */
export interface Derate {
  span_k: number;
  floor_share: number;
}

export function powerCap_share(d: Derate | null, coolant_c: number, limit_c: number): number {
  if (d === null || coolant_c <= limit_c) return 1;
  return Math.max(d.floor_share, 1 - ((1 - d.floor_share) * (coolant_c - limit_c)) / d.span_k);
}
