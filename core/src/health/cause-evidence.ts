import type { MaintenanceAction, MaintenanceEntry, TripResult } from '@thermargin/shared';
import { median } from '../stats/quantile.ts';
import type { HealthOptions } from './options.ts';
import { maintenanceTime_ms } from './rebaseline.ts';
import { headEnd, lowerBound, tailStart } from '@thermargin/shared/array-index';

/** The trip-level signs (besides band k) that tell the causes apart, over recent trips. */
export interface Evidence {
  /**
   * Last soak checks (key-on after a long stop): how many, how many beyond tolerance with the majority
   * sign; `run`: the newest checks that are all beyond tolerance on one side, when the first was, and
   * when the check before them was (null when none since the last sensor replacement).
   */
  soak: {
    checks: number;
    hits: number;
    sign: -1 | 1;
    median_k: number | null;
    run: { checks: number; sign: -1 | 1; since_ms: number; previous_ms: number | null } | null;
  };
  /**
   * Recent trips with sensor flags. `held`: the flagged share reached the suspect level since the last
   * sensor replacement and the trips have not run clean for a whole window since, so a bad sensor that
   * glitches on only some trips stays suspect instead of flickering with the window's luck.
   */
  flags: { trips: number; flagged: number; examples: string[]; held: boolean };
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

/**
 * Collects the evidence trip by trip (time order) and reads it at the latest trip. Each read costs its
 * windows (indexes into the history), not the whole history since the last reset.
 */
export class EvidenceTracker {
  private readonly trips: TripResult[] = [];
  private readonly times: number[] = [];
  /** Trip indices with a soak check, and with a radiator ΔT per kW. */
  private readonly soakAt: number[] = [];
  private readonly dtAt: number[] = [];
  private readonly resets: Record<keyof Evidence, number[]>;
  /** The flags as of the latest trip; `held` latches when a window reaches the suspect share and
   *  clears after a clean window or a reset. */
  private flags: Evidence['flags'] = { trips: 0, flagged: 0, examples: [], held: false };
  private flagFrom = 0;
  private cleanRun = 0;

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
    const i = this.trips.length;
    this.trips.push(t);
    this.times.push(t_ms);
    if (t.soak_offset_k !== null) this.soakAt.push(i);
    if (t.coolant_dt_per_kw !== null) this.dtAt.push(i);
    const from = this.since('flags');
    let held = this.flags.held;
    if (from !== this.flagFrom) {
      this.flagFrom = from;
      held = false;
      this.cleanRun = 0;
    }
    this.cleanRun = t.sensor_flags.length > 0 ? 0 : this.cleanRun + 1;
    // The last `sensor_flag_window` trips since the reset, and those of them that carry flags.
    const recent = this.trips.slice(from + tailStart(this.trips.length - from, this.o.sensor_flag_window));
    const flagged = recent.filter((r) => r.sensor_flags.length > 0);
    if (flagged.length / recent.length >= this.o.sensor_flag_share) held = true;
    else if (this.cleanRun >= this.o.sensor_flag_window) held = false;
    this.flags = {
      trips: recent.length,
      flagged: flagged.length,
      examples: flagged.flatMap((r) => r.sensor_flags).slice(0, 2),
      held,
    };
  }

  /** Index of the first trip since the last reset of `what`. */
  private since(what: keyof Evidence): number {
    const now = this.times[this.times.length - 1] ?? 0;
    const from = Math.max(Number.NEGATIVE_INFINITY, ...this.resets[what].filter((r) => r <= now));
    return lowerBound(this.times, from);
  }

  /** Baseline (first trips) and recent medians of `count` per-trip values read by `at`. */
  private split(
    count: number,
    at: (k: number) => number,
  ): { baseline: number | null; recent: number | null } {
    const N = this.o.baseline_trips;
    const values = (from: number, to: number) => Array.from({ length: to - from }, (_, k) => at(from + k));
    const baseline = median0(values(0, headEnd(count, N)));
    if (count < N + this.o.min_level_trips) return { baseline, recent: null };
    return { baseline, recent: median0(values(tailStart(count, N), count)) };
  }

  read(): Evidence {
    const { trips, soakAt, dtAt } = this;
    const n = trips.length;
    const soakFrom = lowerBound(soakAt, this.since('soak'));
    const window = soakFrom + tailStart(soakAt.length - soakFrom, this.o.soak_window);
    const soakIdx = soakAt.slice(window);
    const soaks = soakIdx.map((i) => trips[i]!.soak_offset_k!);
    const tol = this.o.soak_tolerance_k;
    const below = soaks.filter((v) => v < -tol).length;
    const above = soaks.filter((v) => v > tol).length;
    // The newest checks beyond tolerance on the side of the latest one.
    const side = (v: number): -1 | 0 | 1 => (v > tol ? 1 : v < -tol ? -1 : 0);
    const sign = soaks.length ? side(soaks[soaks.length - 1]!) : 0;
    let first = soaks.length;
    while (sign !== 0 && first > 0 && side(soaks[first - 1]!) === sign) first--;
    const before = window + first - 1 >= soakFrom ? soakAt[window + first - 1]! : null;
    const run =
      sign === 0
        ? null
        : {
            checks: soaks.length - first,
            sign,
            since_ms: this.times[soakIdx[first]!]!,
            previous_ms: before === null ? null : this.times[before]!,
          };
    const satFrom = this.since('saturation');
    const dtFrom = lowerBound(dtAt, this.since('coolant_dt'));
    return {
      soak: {
        checks: soaks.length,
        hits: Math.max(below, above),
        sign: below >= above ? -1 : 1,
        median_k: median0(soaks),
        run,
      },
      flags: this.flags,
      saturation: this.split(n - satFrom, (k) => trips[satFrom + k]!.fan_saturated_share),
      coolant_dt: this.split(dtAt.length - dtFrom, (k) => trips[dtAt[dtFrom + k]!]!.coolant_dt_per_kw!),
    };
  }
}

function median0(v: number[]): number | null {
  return v.length ? median(v) : null;
}
