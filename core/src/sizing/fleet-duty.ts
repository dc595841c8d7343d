import type { TripResult } from '@thermargin/shared';
import { median, quantileSorted } from '../stats/quantile.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { DUTY_FIGURES, type DrivetrainComparison, type Duty, type DutySource } from './drivetrain-compare.ts';
import type { VehicleSamples } from './vehicle-samples.ts';

/**
 * The duty the drivetrains are compared on where neither the caller nor the fleet's data give a figure:
 * a car at 125 km/h on a 40 °C day (round figures).
 */
export const DEFAULT_DUTY: Readonly<Duty> = Object.freeze({
  mass_kg: 1500,
  cda_m2: 0.6,
  crr: 0.01,
  speed_kmh: 125,
  ambient_c: 40,
});

/** –, 0.95: percentile of the trips' hottest ambient that stands for the fleet's hot day. */
const HOT_TRIPS = 0.95;

export interface FleetDuty {
  duty: Duty;
  source: Record<(typeof DUTY_FIGURES)[number], DutySource>;
  note: string;
}

/**
 * The fleet's own duty: per vehicle, its road load fitted from its samples (road-load-fit.ts), its
 * typical speed (the median of the time it drove at ≥ 5 km/h; the mean trip speed without samples) and
 * its hot day (the 95th percentile of its trips' hottest ambient); the fleet's figure is the median over
 * vehicles, so one odd vehicle (a biased sensor) does not set it. Figures `given` win; those the data
 * cannot give come from DEFAULT_DUTY, and `source` says which is which.
 */
export function fleetDuty(
  input: {
    vehicles: readonly VehicleModel[];
    trips: ReadonlyMap<string, readonly TripResult[]>;
    samples?: ReadonlyMap<string, VehicleSamples>;
  },
  given: Partial<Duty>,
): FleetDuty {
  const fits = [];
  const speeds: number[] = [];
  const hot: number[] = [];
  for (const v of input.vehicles) {
    const s = input.samples?.get(v.id);
    const trips = input.trips.get(v.id) ?? [];
    const fit = s?.roadLoad.result() ?? null;
    if (fit) fits.push(fit);
    if (s && s.movingSpeed.total > 0) speeds.push(s.movingSpeed.quantile(0.5)!);
    else {
      const mean = trips
        .map((t) => t.distance_km / ((Date.parse(t.end) - Date.parse(t.start)) / 3_600_000))
        .filter((x) => Number.isFinite(x) && x > 0);
      if (mean.length) speeds.push(median(mean));
    }
    if (trips.length)
      hot.push(quantileSorted(Float64Array.from(trips, (t) => t.ambient_max_c).sort(), HOT_TRIPS));
  }
  const cda = fits.map((f) => f.cda_m2).filter((x): x is number => x !== null);
  const crr = fits.map((f) => f.crr).filter((x): x is number => x !== null);
  const data: Partial<Duty> = {
    ...(fits.length ? { mass_kg: median(fits.map((f) => f.mass_kg)) } : {}),
    ...(cda.length ? { cda_m2: median(cda) } : {}),
    ...(crr.length ? { crr: median(crr) } : {}),
    ...(speeds.length ? { speed_kmh: median(speeds) } : {}),
    ...(hot.length ? { ambient_c: median(hot) } : {}),
  };
  const duty: Duty = { ...DEFAULT_DUTY, ...data, ...given };
  const source = Object.fromEntries(
    DUTY_FIGURES.map((k) => [
      k,
      given[k] !== undefined ? 'given' : data[k] !== undefined ? 'fleet_data' : 'default',
    ]),
  ) as FleetDuty['source'];
  const of = (n: number) => `median of ${n} vehicle${n === 1 ? '' : 's'}' road load fitted to their samples`;
  const note = [
    fits.length
      ? `mass: ${of(fits.length)}; CdA: ${cda.length ? of(cda.length) : 'a car’s (the fits could not tell it from the grades)'}; Crr: ${crr.length ? of(crr.length) : 'a car’s (the fits could not tell it from the grades)'}`
      : 'mass, CdA and Crr: a car’s (no road load could be fitted: no samples, or too few moving ones)',
    `speed: median of ${speeds.length} vehicles' typical moving speed`,
    `ambient: median of ${hot.length} vehicles' hot day (95th percentile of their trips' hottest ambient)`,
  ].join('; ');
  return { duty, source, note };
}

export function withDutySource(c: DrivetrainComparison, d: FleetDuty): DrivetrainComparison {
  return { ...c, duty_source: d.source, duty_note: d.note };
}
