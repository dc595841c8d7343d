import type { TripResult } from '@thermargin/shared';
import { median } from '../stats/quantile.ts';
import { AIRSIDE_DEFAULTS, type Airside } from '../radiator/airside.ts';
import type { VehicleModel } from '../vehicle/resolve.ts';
import { compareDrivetrains, type DrivetrainComparison, type Duty } from './drivetrain-compare.ts';
import { fleetDuty, withDutySource } from './fleet-duty.ts';
import { type GroupSizing, sizeGroup } from './group-sizing.ts';
import { type MethodNote, SIZING_METHOD } from './method.ts';
import type { SizingOptions } from './options.ts';
import type { VehicleSamples } from './vehicle-samples.ts';
import { sizeVehicle, type VehicleSizing } from './vehicle-sizing.ts';

export { DEFAULT_DUTY } from './fleet-duty.ts';

/** W/(m²·K): k of the comparison when the fleet gives none (a round figure, from memory). */
export const DEFAULT_COMPARISON_K_W_M2K = 1000;

export interface SizingInput {
  vehicles: readonly VehicleModel[];
  /** Trip results per vehicle id, in time order. */
  trips: ReadonlyMap<string, readonly TripResult[]>;
  /** Sample-level accumulators per vehicle id, when the samples were read (duty cycle, derates, what if). */
  samples?: ReadonlyMap<string, VehicleSamples>;
  /** The drivetrain comparison's duty, whole or in part; the rest from the fleet's data (fleetDuty). */
  duty?: Partial<Duty>;
}

/** The whole sizing result: plain JSON (no Infinity, no Maps), served by the API as it is. */
export interface SizingResult {
  schema: 'thermargin.sizing/1';
  period: { first_trip: string | null; last_trip: string | null; trips: number; samples: number };
  options: SizingOptions;
  vehicles: VehicleSizing[];
  types: GroupSizing[];
  fleet: GroupSizing;
  drivetrains: DrivetrainComparison;
  method: readonly MethodNote[];
  /** The air-side defaults each vehicle's learned figures (VehicleSizing.airside_fit) stand beside. */
  airside_defaults: Airside;
}

/**
 * Closes the sizing loop for a fleet (docs/methods.md §6): per vehicle, per type (VehicleModel.type) and for
 * the fleet — field against bench k, duty cycle, fouling rates and allowance, derates, the design
 * point checked against field evidence, the "what if" replay, and a drivetrain comparison at the
 * fleet's median design-point k on the fleet's own duty (fleet-duty.ts). `o` must come from
 * resolveSizingOptions (the samples were fed with it).
 */
export function sizeFleet(input: SizingInput, o: SizingOptions): SizingResult {
  const sized = input.vehicles.map((v) => {
    const samples = input.samples?.get(v.id) ?? null;
    return { v, samples, s: sizeVehicle(v, input.trips.get(v.id) ?? [], samples, o) };
  });
  const withSamples = (xs: typeof sized) =>
    xs.map((x) => x.samples).filter((s): s is VehicleSamples => s !== null);
  const types = [...new Set(sized.map((x) => x.v.type))].sort().map((type) => {
    const members = sized.filter((x) => x.v.type === type);
    return sizeGroup(
      type,
      members.map((x) => x.s),
      withSamples(members),
      o,
    );
  });
  const allTrips = sized.flatMap((x) => input.trips.get(x.v.id) ?? []);
  const duty = fleetDuty(input, input.duty ?? {});
  const starts = allTrips.map((t) => t.start).sort();
  const designK = sized
    .map((x) => x.s.design_check?.k_design_w_m2k)
    .filter((k): k is number => k !== undefined);
  return {
    schema: 'thermargin.sizing/1',
    period: {
      first_trip: starts[0] ?? null,
      last_trip: starts.at(-1) ?? null,
      trips: allTrips.length,
      samples: sized.reduce((s, x) => s + (x.samples?.samples ?? 0), 0),
    },
    options: o,
    vehicles: sized.map((x) => x.s),
    types,
    fleet: sizeGroup(
      'fleet',
      sized.map((x) => x.s),
      withSamples(sized),
      o,
    ),
    drivetrains: withDutySource(
      compareDrivetrains(duty.duty, designK.length ? median(designK) : DEFAULT_COMPARISON_K_W_M2K),
      duty,
    ),
    method: SIZING_METHOD,
    airside_defaults: { ...AIRSIDE_DEFAULTS },
  };
}
