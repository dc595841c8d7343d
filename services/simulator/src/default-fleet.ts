import { DAY_MS } from '@thermargin/shared/time';
import { ARCHETYPES, type Archetype } from './archetypes.ts';
import type { FaultSpec, MaintenanceEvent } from './faults.ts';
import type { SensorFit } from './sensors.ts';
import { buildVehicle, type SimVehicle, type VehicleBuild } from './vehicle.ts';

/**
 * The invented demo operator: "Ferrowick Civic Transport" in the hill town of Ferrowick (both names
 * made up), running fuel-cell buses on its town and express lines, battery-electric delivery vans and one
 * diesel tractor-trailer on the quarry road. The roster is in priority order: a smaller fleet keeps the
 * first entries, so every fault case survives down to six vehicles.
 */
export const OPERATOR = 'Ferrowick Civic Transport';

export type DemoRole =
  | 'healthy'
  | 'fouling'
  | 'fan_failure'
  | 'cleaned'
  | 'ambient_bias'
  | 'pump_wear'
  | 'sensor_spikes';

interface RosterEntry {
  id: string;
  archetype: Archetype['key'];
  role: DemoRole;
  sensors: SensorFit;
  bench: boolean;
}

const NONE: SensorFit = { outlet: false, flow: false };
const OUTLET: SensorFit = { outlet: true, flow: false };
const FULL: SensorFit = { outlet: true, flow: true };

const ROSTER: readonly RosterEntry[] = [
  { id: 'bus-01', archetype: 'bus', role: 'healthy', sensors: FULL, bench: true },
  { id: 'bus-02', archetype: 'bus', role: 'fouling', sensors: OUTLET, bench: true },
  { id: 'bus-03', archetype: 'bus', role: 'fan_failure', sensors: NONE, bench: false },
  { id: 'bus-04', archetype: 'bus', role: 'cleaned', sensors: OUTLET, bench: true },
  { id: 'van-02', archetype: 'van', role: 'ambient_bias', sensors: NONE, bench: false },
  { id: 'truck-01', archetype: 'truck', role: 'pump_wear', sensors: FULL, bench: true },
  { id: 'van-01', archetype: 'van', role: 'healthy', sensors: OUTLET, bench: true },
  { id: 'bus-05', archetype: 'bus', role: 'healthy', sensors: NONE, bench: false },
  { id: 'van-03', archetype: 'van', role: 'sensor_spikes', sensors: NONE, bench: false },
  { id: 'van-04', archetype: 'van', role: 'healthy', sensors: NONE, bench: false },
];

/** Roster of `count` vehicles: the list above, then healthy buses and vans alternately. */
export function demoRoster(count: number): RosterEntry[] {
  const out = ROSTER.slice(0, count);
  for (let i = ROSTER.length; i < count; i++) {
    const bus = i % 2 === 0;
    const n = String(Math.floor((i - ROSTER.length) / 2) + (bus ? 6 : 5)).padStart(2, '0');
    out.push({
      id: bus ? `bus-${n}` : `van-${n}`,
      archetype: bus ? 'bus' : 'van',
      role: 'healthy',
      sensors: NONE,
      bench: false,
    });
  }
  return out;
}

/** When things happen, as shares of the history (so a short history keeps every event inside it). */
export interface Timeline {
  from_ms: number;
  to_ms: number;
  utc_offset_h: number;
}

/** Epoch ms of local hour `h` on the day at share `x` of the history. */
function at(t: Timeline, x: number, h: number): number {
  const off = t.utc_offset_h * 3_600_000;
  const day = Math.floor((t.from_ms + x * (t.to_ms - t.from_ms) + off) / DAY_MS);
  return day * DAY_MS - off + h * 3_600_000;
}

/**
 * m²·K/W (frontal-area basis): the R* that takes the clean margin m to `target_margin` at the asymptote,
 * with the air-flow share β lost there: k∞ = 1 / (1/(k·(1−β)^n) + R*) = k·(1 + target)/(1 + m), solved
 * for R* at the design k (radiator.ts).
 */
export function foulingResistanceFor(v: SimVehicle, target_margin: number, airflow_loss: number): number {
  const keep = (1 + target_margin) / (1 + v.clean_margin); // k∞ / k_clean wanted
  const airKeep = (1 - airflow_loss) ** v.radiator.airside.velocity_exponent;
  const k = v.radiator.k_design_w_m2k;
  return Math.max(0, 1 / (keep * k) - 1 / (airKeep * k));
}

/** The fault and the workshop visit (if any) each demo role gets on a vehicle. */
export function roleEvents(
  role: DemoRole,
  v: SimVehicle,
  t: Timeline,
): { faults: FaultSpec[]; maintenance: MaintenanceEvent[] } {
  const span_days = (t.to_ms - t.from_ms) / DAY_MS;
  const id = v.id;
  switch (role) {
    case 'healthy':
      return { faults: [], maintenance: [] };
    // Quiet and asymptotic, after a clean first 40–45 % of the history: each band learns its reference on a clean
    // core first (the ram band, driven on a few trips a day, needs days for it), as the monitor assumes.
    // Crosses the inspect margin (0 %) at about two thirds of the history.
    case 'fouling':
      return {
        faults: [
          {
            kind: 'fouling',
            vehicle: id,
            from_ms: at(t, 0.45, 0),
            r_star_m2k_w: foulingResistanceFor(v, -0.1, 0.15),
            tau_days: 0.2 * span_days,
            airflow_loss: 0.15,
          },
        ],
        maintenance: [],
      };
    case 'cleaned': // arrives well fouled, cleaned at mid-history, then fouls again slowly
      return {
        faults: [
          {
            kind: 'fouling',
            vehicle: id,
            from_ms: t.from_ms,
            r_star_m2k_w: foulingResistanceFor(v, -0.05, 0.15),
            tau_days: span_days,
            airflow_loss: 0.15,
            initial_share: 0.75,
          },
        ],
        maintenance: [
          {
            vehicle: id,
            at_ms: at(t, 0.5, 22),
            action: 'radiator_cleaned',
            note: 'fins blown out and washed; heavy dust and insects',
          },
        ],
      };
    case 'fan_failure': // abrupt, four days before the end (a third of the fan's air flow left)
      return {
        faults: [{ kind: 'fan_loss', vehicle: id, at_ms: at(t, 1 - 4 / span_days, 12), remaining: 0.3 }],
        maintenance: [],
      };
    case 'ambient_bias':
      return {
        faults: [
          { kind: 'sensor_bias', vehicle: id, signal: 'ambient_c', from_ms: at(t, 0.4, 0), offset: 6 },
        ],
        maintenance: [],
      };
    case 'pump_wear':
      return {
        faults: [
          {
            kind: 'coolant_flow_loss',
            vehicle: id,
            from_ms: at(t, 0.25, 0),
            ramp_days: 0.5 * span_days,
            loss: 0.45,
          },
        ],
        maintenance: [],
      };
    case 'sensor_spikes': {
      const to_ms = at(t, 0.62, 20);
      return {
        faults: [
          {
            kind: 'sensor_spikes',
            vehicle: id,
            signal: 'coolant_in_c',
            from_ms: at(t, 0.5, 0),
            to_ms,
            per_hour: 20,
            magnitude: 25,
          },
        ],
        maintenance: [
          {
            vehicle: id,
            at_ms: to_ms,
            action: 'sensor_replaced',
            note: 'radiator inlet temperature sensor, intermittent connector',
          },
        ],
      };
    }
  }
}

/** The demo fleet's vehicles with the physics drawn from the seed (no faults attached yet). */
export function demoVehicles(count: number, seed: number): { vehicle: SimVehicle; role: DemoRole }[] {
  return demoRoster(count).map((r) => {
    const b: VehicleBuild = {
      id: r.id,
      archetype: ARCHETYPES[r.archetype],
      sensors: r.sensors,
      bench: r.bench,
    };
    return { vehicle: buildVehicle(b, seed), role: r.role };
  });
}
