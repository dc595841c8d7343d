import type { MarginSource, TripResult } from '@thermargin/shared';
import type { Band } from '../trip/bands.ts';
import { roundTo } from '../stats/round.ts';

/** A trip's design-point margin: %, limiting ambient °C, the band whose k it comes from, and how. */
export interface TripMargin {
  margin_pct: number | null;
  limiting_ambient_c: number | null;
  margin_basis: Band | null;
  margin_source: MarginSource | null;
}

/** The trip's own margin from its own k, as the trip analysis gave it (kept aside once a vehicle result replaced it). */
export function ownMargin(t: TripResult): { pct: number | null; lat: number | null; basis: Band | null } {
  return t.trip_margin_pct !== undefined
    ? { pct: t.trip_margin_pct, lat: t.trip_limiting_ambient_c ?? null, basis: t.trip_margin_basis ?? null }
    : { pct: t.margin_pct, lat: t.limiting_ambient_c, basis: t.margin_basis };
}

/**
 * Each trip's margin from the band that governs the design point: the trip's own when it gave that
 * band a clean k; else the band's current level, so a fan-band fault shows on the ram-only trips after
 * it too; else, while that band has no level yet, the trip's own margin through the other band (moved
 * along the air-side model, and marked so). Trips between a change's start and its detection take the
 * new segment's level once it is found: the only hindsight, and it moves no decision.
 */
export class TripMargins {
  readonly out: TripMargin[];
  /** Input index and start of each trip that took the band's level, in time order. */
  private readonly levelled: { i: number; ms: number }[] = [];

  constructor(
    n: number,
    private readonly basis: Band,
    private readonly latOf: (margin_pct: number) => number,
  ) {
    this.out = Array.from({ length: n }, () => ({
      margin_pct: null,
      limiting_ambient_c: null,
      margin_basis: null,
      margin_source: null,
    }));
  }

  /** Trip `t` (input index `i`, start `ms`); `level`: the governing band's margin level after it, or null. */
  take(t: TripResult, i: number, ms: number, level: number | null): void {
    const own = ownMargin(t);
    if (own.pct !== null && own.basis === this.basis && t.sensor_flags.length === 0) {
      this.out[i] = {
        margin_pct: own.pct,
        limiting_ambient_c: own.lat,
        margin_basis: own.basis,
        margin_source: 'trip',
      };
    } else if (level !== null) {
      this.setLevel(i, level);
      this.levelled.push({ i, ms });
    } else {
      this.out[i] = {
        margin_pct: own.pct,
        limiting_ambient_c: own.lat,
        margin_basis: own.basis,
        margin_source: own.pct === null ? null : own.basis === this.basis ? 'trip' : 'other_band',
      };
    }
  }

  /** A change of the governing band found to start at `since_ms`: its level so far for the trips since. */
  changed(since_ms: number, level: number | null): void {
    if (level === null) return;
    for (let k = this.levelled.length - 1; k >= 0 && this.levelled[k]!.ms >= since_ms; k--)
      this.setLevel(this.levelled[k]!.i, level);
  }

  private setLevel(i: number, level: number): void {
    this.out[i] = {
      margin_pct: roundTo(level, 2),
      limiting_ambient_c: roundTo(this.latOf(level), 2),
      margin_basis: this.basis,
      margin_source: 'band_level',
    };
  }
}
