import type { TripProfile } from './drive-profile.ts';

/**
 * Trip profiles used by the recovery tests. The hot mixed trip: key-on after a soak, a hilly highway
 * leg (ram band), a climbing stop-and-go district (fan band), then standing with an extra auxiliary
 * load (a power take-off or cabin cooling at a terminus; also fan band).
 */
export interface HotTripOptions {
  highway_kmh: [number, number];
  /** –: mean and rolling amplitude of the highway grade. */
  highway_grade: [number, number];
  crawl_grade: number;
  aux_kw: number;
  /** kW: extra load while standing at the end. */
  standing_extra_kw: number;
  ambient_start_c: number;
  ambient_end_c: number;
  /** s: length of the highway, crawl and standing legs. */
  highway_s?: number;
  crawl_s?: number;
  standing_s?: number;
}

export function hotMixedTrip(o: HotTripOptions): TripProfile {
  return {
    aux_kw: o.aux_kw,
    ambient_start_c: o.ambient_start_c,
    ambient_end_c: o.ambient_end_c,
    segments: [
      { kind: 'idle', duration_s: 120 },
      {
        kind: 'highway',
        duration_s: o.highway_s ?? 2700,
        min_kmh: o.highway_kmh[0],
        max_kmh: o.highway_kmh[1],
        grade_mean: o.highway_grade[0],
        grade: o.highway_grade[1],
        grade_wavelength_m: 6000,
      },
      {
        kind: 'crawl',
        duration_s: o.crawl_s ?? 1800,
        max_kmh: 20,
        grade: o.crawl_grade,
        go_s: [40, 120],
        stop_s: [5, 20],
      },
      { kind: 'idle', duration_s: o.standing_s ?? 1200, extra_kw: o.standing_extra_kw },
    ],
  };
}

/** The hot mixed trip of each vehicle in vehicles.ts, tuned so both bands get a good share of it. */
export const HOT_TRIPS: Readonly<Record<string, HotTripOptions>> = Object.freeze({
  /** Standing: the stack recharging the buffer battery at a terminus. */
  'fc-bus-01': {
    highway_kmh: [70, 90],
    highway_grade: [0.004, 0.012],
    crawl_grade: 0.06,
    aux_kw: 25,
    standing_extra_kw: 45,
    ambient_start_c: 34,
    ambient_end_c: 41,
  },
  /** Standing: an electric refrigeration unit and cabin cooling while loading. */
  'ev-van-01': {
    highway_kmh: [75, 100],
    highway_grade: [0.006, 0.012],
    crawl_grade: 0.1,
    aux_kw: 5,
    standing_extra_kw: 16,
    ambient_start_c: 34,
    ambient_end_c: 42,
  },
  /** Standing: a hydraulic power take-off at a work site. */
  'dx-truck-01': {
    highway_kmh: [75, 90],
    highway_grade: [0.006, 0.01],
    crawl_grade: 0.05,
    aux_kw: 8,
    standing_extra_kw: 140,
    ambient_start_c: 36,
    ambient_end_c: 43,
  },
});

export interface StopAndGoOptions {
  grade: number;
  aux_kw: number;
  go_s: [number, number];
  stop_s: [number, number];
  duration_s: number;
}

/** Transient-heavy trip: climbing stop-and-go traffic on a hot afternoon (40 → 43 °C), nothing else. */
export function stopAndGoTrip(o: StopAndGoOptions): TripProfile {
  return {
    aux_kw: o.aux_kw,
    ambient_start_c: 40,
    ambient_end_c: 43,
    segments: [
      { kind: 'idle', duration_s: 60 },
      {
        kind: 'crawl',
        duration_s: o.duration_s,
        max_kmh: 20,
        grade: o.grade,
        go_s: o.go_s,
        stop_s: o.stop_s,
      },
    ],
  };
}

/** A cold, light day: 5 °C, a flat, unhurried town-and-ring-road run that never opens the thermostat fully. */
export function coldLightTrip(aux_kw: number): TripProfile {
  return {
    aux_kw,
    ambient_start_c: 4,
    ambient_end_c: 6,
    segments: [
      { kind: 'idle', duration_s: 120 },
      { kind: 'crawl', duration_s: 900, max_kmh: 20, grade: 0, go_s: [30, 90], stop_s: [10, 30] },
      {
        kind: 'highway',
        duration_s: 1500,
        min_kmh: 60,
        max_kmh: 75,
        grade_mean: 0,
        grade: 0.005,
        grade_wavelength_m: 6000,
      },
      { kind: 'idle', duration_s: 300 },
    ],
  };
}
