import type { MaintenanceAction, MaintenanceEntry, TripResult } from '@thermargin/shared';
import { median } from '../stats/quantile.ts';
import type { HealthOptions } from './options.ts';
import { maintenanceTime_ms } from './rebaseline.ts';

/** The trip-level signs (besides band k) that tell the causes apart, over recent trips. */
export interface Evidence {
  /** Last soak checks (key-on after a long stop): how many, how many beyond tolerance with the majority sign. */
  soak: { checks: number; hits: number; sign: -1 | 1; median_k: number | null };
  flags: { trips: number; flagged: number; examples: string[] };
  /** Median share of time at full fan duty: first trips after the reset vs recent trips. */
  saturation: { baseline: number | null; recent: number | null };
  /** Median radiator ΔT per kW (K/kW), same split; null without an outlet sensor. */
  coolant_dt: { baseline: number | null; recent: number | null };
}

/** Which maintenance restarts which piece of evidence. */
const RESETS: Record<keyof Evidence, readonly MaintenanceAction[]> = {
  soak: ['sensor_replaced'],
  flags: ['sensor_replaced'],
  saturation: ['fan_repaired', 'radiator_cleaned'],
  coolant_dt: ['coolant_serviced'],
};

/** Collects the evidence trip by trip (time order) and reads it at the latest trip. */
export class EvidenceTracker {
  private readonly trips: TripResult[] = [];
  private readonly times: number[] = [];
  private readonly resets: Record<keyof Evidence, number[]>;

  constructor(
    log: readonly MaintenanceEntry[],
    private readonly o: HealthOptions,
  ) {
    const times = (acts: readonly MaintenanceAction[]) =>
      log.filter((m) => acts.includes(m.action)).map(maintenanceTime_ms);
    this.resets = {
      soak: times(RESETS.soak),
      flags: times(RESETS.flags),
      saturation: times(RESETS.saturation),
      coolant_dt: times(RESETS.coolant_dt),
    };
  }

  push(t: TripResult, t_ms: number): void {
    this.trips.push(t);
    this.times.push(t_ms);
  }

  /** Trips since the last reset of `what`. */
  private since(what: keyof Evidence): TripResult[] {
    const now = this.times[this.times.length - 1] ?? 0;
    const from = Math.max(Number.NEGATIVE_INFINITY, ...this.resets[what].filter((r) => r <= now));
    return this.trips.filter((_, i) => this.times[i]! >= from);
  }

  /** Baseline (first trips) and recent medians of a per-trip value. */
  private split(values: number[]): { baseline: number | null; recent: number | null } {
    const N = this.o.baseline_trips;
    if (values.length < N + this.o.min_level_trips)
      return { baseline: median0(values.slice(0, N)), recent: null };
    return { baseline: median0(values.slice(0, N)), recent: median0(values.slice(-N)) };
  }

  read(): Evidence {
    const soaks = this.since('soak')
      .map((t) => t.soak_offset_k)
      .filter((v): v is number => v !== null)
      .slice(-this.o.soak_window);
    const tol = this.o.soak_tolerance_k;
    const below = soaks.filter((v) => v < -tol).length;
    const above = soaks.filter((v) => v > tol).length;
    const recentFlags = this.since('flags').slice(-this.o.sensor_flag_window);
    const flagged = recentFlags.filter((t) => t.sensor_flags.length > 0);
    return {
      soak: {
        checks: soaks.length,
        hits: Math.max(below, above),
        sign: below >= above ? -1 : 1,
        median_k: median0(soaks),
      },
      flags: {
        trips: recentFlags.length,
        flagged: flagged.length,
        examples: flagged.flatMap((t) => t.sensor_flags).slice(0, 2),
      },
      saturation: this.split(this.since('saturation').map((t) => t.fan_saturated_share)),
      coolant_dt: this.split(
        this.since('coolant_dt')
          .map((t) => t.coolant_dt_per_kw)
          .filter((v): v is number => v !== null),
      ),
    };
  }
}

function median0(v: number[]): number | null {
  return v.length ? median(v) : null;
}
