import { setImmediate as nextTurn } from 'node:timers/promises';
import type { TripResult } from '@thermargin/shared';
import { openSampleStore, type ResultsStore, type SampleStore } from '@thermargin/store';
import { openResults } from '@thermargin/store/results-backend';
import { tripPieces } from '@thermargin/core/analyze';
import type { Duty } from '@thermargin/core/sizing/drivetrain-compare';
import type { SizingInput } from '@thermargin/core/sizing/fleet-sizing';
import type { SizingOptions } from '@thermargin/core/sizing/options';
import { VehicleSamples } from '@thermargin/core/sizing/vehicle-samples';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import type { DeploymentConfig } from './config.ts';
import { READ_DEFAULTS } from './options.ts';

export interface StoreSizingInput {
  input: SizingInput;
  /** Stored trips whose samples are gone (retention) or no longer split into them: trip figures only. */
  trips_without_samples: number;
}

/** One vehicle's part of the sizing input. */
export interface VehicleSizingInput {
  trips: TripResult[];
  samples: VehicleSamples;
  trips_without_samples: number;
}

/**
 * One vehicle's stored trip results, and its stored samples fed to VehicleSamples in pieces cut at
 * those trips' starts — the cuts the analyzer and the CLI make — so the figures equal `thermargin
 * sizing --data` on the same samples. A piece spans whole trips up to `chunk_ms` (the analyzer's read
 * size) and ends with the last analysed trip: samples of a trip still open are left for the next run.
 * A piece is cleaned and split as the analysis does (tripPieces); when its samples are gone, or no
 * longer split into its stored trips, those trips count as without samples. `o` must come from
 * resolveSizingOptions; a what-if limit drop at or below the thermostat opening throws VehicleSamples'
 * RangeError.
 */
export async function vehicleSizingInput(
  samples: SampleStore,
  results: ResultsStore,
  v: VehicleModel,
  o: SizingOptions,
  chunk_ms: number = READ_DEFAULTS.chunk_ms,
): Promise<VehicleSizingInput> {
  const acc = new VehicleSamples(v, o);
  const trips = await results.readTripResults(v.id);
  const starts = trips.map((t) => Date.parse(t.start));
  let missing = 0;
  let i = 0;
  while (i < trips.length) {
    let j = i + 1;
    while (j < trips.length && starts[j]! - starts[i]! < chunk_ms) j++;
    // The first piece reaches back to the vehicle's first sample, as the analyzer's first read does.
    const from = i === 0 ? 0 : starts[i]!;
    const to = j < trips.length ? starts[j]! : Date.parse(trips[j - 1]!.end) + 1;
    const piece = trips.slice(i, j);
    // A turn of the event loop between pieces: a SQLite read resolves at once, and a fleet's pieces
    // back to back would hold a server in the same process (the API) for seconds.
    await nextTurn();
    const c = await samples.readSamples(v.id, from, to);
    const { columns, spans } = tripPieces(c);
    // A piece that cleaning empties adds nothing and misses nothing (its trips kept no usable samples).
    if (c.n === 0 || (columns.n > 0 && spans.length !== piece.length)) missing += piece.length;
    else acc.add(columns, spans, piece);
    i = j;
  }
  return { trips, samples: acc, trips_without_samples: missing };
}

/** The whole fleet's sizing input from the stores instead of CSV files (vehicleSizingInput for each). */
export async function sizingInputFromStore(
  samples: SampleStore,
  results: ResultsStore,
  vehicles: readonly VehicleModel[],
  o: SizingOptions,
  duty?: Partial<Duty>,
): Promise<StoreSizingInput> {
  const parts: VehicleSizingInput[] = [];
  for (const v of vehicles) parts.push(await vehicleSizingInput(samples, results, v, o));
  return assembleSizingInput(vehicles, parts, duty);
}

/** The per-vehicle parts (in `vehicles` order) as one SizingInput. */
export function assembleSizingInput(
  vehicles: readonly VehicleModel[],
  parts: readonly VehicleSizingInput[],
  duty?: Partial<Duty>,
): StoreSizingInput {
  return {
    input: {
      vehicles,
      trips: new Map(vehicles.map((v, k) => [v.id, parts[k]!.trips])),
      samples: new Map(vehicles.map((v, k) => [v.id, parts[k]!.samples])),
      ...(duty ? { duty } : {}),
    },
    trips_without_samples: parts.reduce((n, p) => n + p.trips_without_samples, 0),
  };
}

/** sizingInputFromStore over the stores a configuration names (the CLI's `sizing --from-store`), closed after. */
export async function sizingInputFromConfig(
  config: Pick<DeploymentConfig, 'samples' | 'results'>,
  vehicles: readonly VehicleModel[],
  o: SizingOptions,
  duty?: Partial<Duty>,
): Promise<StoreSizingInput> {
  const samples = openSampleStore(config.samples);
  try {
    const results = await openResults(config.results);
    try {
      return await sizingInputFromStore(samples, results.analysis, vehicles, o, duty);
    } finally {
      await results.close();
    }
  } finally {
    await samples.close();
  }
}
