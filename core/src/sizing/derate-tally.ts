import { roundTo } from '../stats/round.ts';
/** Derate time, events and energy not delivered, in total and per UTC day driven. */
export interface DerateDay {
  /** UTC date YYYY-MM-DD. */
  date: string;
  events: number;
  hours: number;
  energy_not_delivered_kwh: number;
}

export interface DerateTotals {
  events: number;
  hours: number;
  /** h: time the tally saw (hours driven or replayed). */
  of_hours: number;
  energy_not_delivered_kwh: number;
  /** Days with any derate, in date order. */
  days: DerateDay[];
}

/** UTC date of an epoch-ms time, YYYY-MM-DD. */
export function utcDate(time_ms: number): string {
  return new Date(time_ms).toISOString().slice(0, 10);
}

/**
 * Counts derated time sample by sample. An event is a run of derated samples within one trip; a trip
 * boundary (`endTrip`) ends it. Memory grows with the days derated, not with the samples.
 */
export class DerateTally {
  private inEvent = false;
  private seconds = 0;
  private seen_s = 0;
  private events = 0;
  private energy_kwh = 0;
  private readonly days = new Map<string, DerateDay>();

  /** One sample held for `dt_s`; `notDelivered_kwh` is the traction energy the derate cost in it. */
  add(time_ms: number, dt_s: number, derated: boolean, notDelivered_kwh = 0): boolean {
    this.seen_s += dt_s;
    if (!derated) {
      this.inEvent = false;
      return false;
    }
    const date = utcDate(time_ms);
    let day = this.days.get(date);
    if (!day) this.days.set(date, (day = { date, events: 0, hours: 0, energy_not_delivered_kwh: 0 }));
    const onset = !this.inEvent;
    if (onset) {
      this.events++;
      day.events++;
      this.inEvent = true;
    }
    this.seconds += dt_s;
    day.hours += dt_s / 3600;
    this.energy_kwh += notDelivered_kwh;
    day.energy_not_delivered_kwh += notDelivered_kwh;
    return onset;
  }

  endTrip(): void {
    this.inEvent = false;
  }

  merge(o: DerateTally): void {
    this.seconds += o.seconds;
    this.seen_s += o.seen_s;
    this.events += o.events;
    this.energy_kwh += o.energy_kwh;
    for (const d of o.days.values()) {
      const mine = this.days.get(d.date);
      if (!mine) this.days.set(d.date, { ...d });
      else {
        mine.events += d.events;
        mine.hours += d.hours;
        mine.energy_not_delivered_kwh += d.energy_not_delivered_kwh;
      }
    }
  }

  totals(): DerateTotals {
    const r3 = (x: number) => roundTo(x, 3);
    return {
      events: this.events,
      hours: r3(this.seconds / 3600),
      of_hours: r3(this.seen_s / 3600),
      energy_not_delivered_kwh: r3(this.energy_kwh),
      days: [...this.days.values()]
        .sort((a, b) => a.date.localeCompare(b.date))
        .map((d) => ({ ...d, hours: r3(d.hours), energy_not_delivered_kwh: r3(d.energy_not_delivered_kwh) })),
    };
  }
}
