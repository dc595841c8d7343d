import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import {
  type DataMap,
  type FleetInput,
  InputError,
  parseDataMapText,
  type RejectedSummary,
} from '@thermargin/shared';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import { loadFleetFile } from '@thermargin/usecases/fleet-file';
import { compileFrames, type DecoderConfig } from '@thermargin/logger-data/j1939/config';
import { emptyFrameCounts, type FrameCounts } from '@thermargin/logger-data/j1939/decoder';
import { candumpSamples } from '@thermargin/logger-data/io/candump-samples';
import { readCsvFile } from '../import/csv-reader.ts';
import { type DataFile, listDataFiles, vehicleOfPath } from '../import/data-files.ts';
import { progressReporter } from '../import/progress.ts';
import { RowAudit } from '../import/row-audit.ts';
import { VehicleStream } from '../import/vehicle-stream.ts';

export interface AnalyzedData {
  vehicles: VehicleModel[];
  streams: Map<string, VehicleStream>;
  rejected: RejectedSummary;
  rows: number;
  /** Per vehicle fed from candump logs: what its frames held. */
  frames: Record<string, FrameCounts>;
  /** Why a vehicle has no trips, in words (its data's refusals, or no data at all). */
  whyNoTrips(vehicle: string): string;
}

export interface DataOptions {
  /** Mapping file (--map) for every file whose vehicle has no mapping of its own in the fleet file. */
  map?: string | undefined;
  /** bytes: the longest table line read (--max-line-bytes; default CSV_LIMITS.max_line_bytes). */
  max_line_bytes?: number | undefined;
}

function readText(path: string, what: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch {
    throw new InputError([{ where: path, rule: `cannot read the ${what}` }], `${what} not found`);
  }
}

export function loadDataMap(path: string): DataMap {
  return parseDataMapText(readText(path, 'mapping file'), path);
}

/** Each vehicle's own mapping from the fleet file (inline, or a file relative to the fleet file). */
function vehicleMaps(fleet: FleetInput, fleetPath: string): Map<string, DataMap> {
  const out = new Map<string, DataMap>();
  for (const v of fleet.vehicles) {
    if (v.data_map === undefined) continue;
    out.set(
      v.id,
      typeof v.data_map === 'string' ? loadDataMap(resolve(dirname(fleetPath), v.data_map)) : v.data_map,
    );
  }
  return out;
}

/**
 * Reads the fleet file and every data file at `dataPath` — tables in the import format or through a
 * mapping, and candump logs of J1939 frames — analysing trips as they complete.
 */
export async function analyzeData(
  fleetPath: string,
  dataPath: string,
  log: (line: string) => void,
  /** Optional observer per vehicle of each analysed piece of samples and its trips (see VehicleStream). */
  observe?: (v: VehicleModel) => ConstructorParameters<typeof VehicleStream>[1],
  options: DataOptions = {},
): Promise<AnalyzedData> {
  const fleet = loadFleetFile(fleetPath);
  const vehicles = [...fleet.models.values()];
  const globalMap = options.map ? loadDataMap(options.map) : undefined;
  const ownMaps = vehicleMaps(fleet.input, fleetPath);
  const torque = new Map(fleet.input.vehicles.map((v) => [v.id, v.engine_reference_torque_nm ?? null]));
  const { files, bytes, skipped } = listDataFiles(dataPath);
  if (skipped.length)
    log(
      `skipped ${skipped.length} files that are neither tables nor candump logs: ${skipped.slice(0, 5).join(', ')}`,
    );
  const ids = vehicles.map((v) => v.id);
  const streams = new Map(vehicles.map((v) => [v.id, new VehicleStream(v, observe?.(v))]));
  const by_reason: Record<string, number> = {};
  const unknown = new Set<string>();
  const frames: Record<string, FrameCounts> = {};
  const audit = new RowAudit(log);
  let rows = 0;
  const reject = (reason: string) => {
    by_reason[reason] = (by_reason[reason] ?? 0) + 1;
  };
  const bad = (where: string, reason: string) => {
    reject(reason);
    audit.bad(where, reason);
  };
  const push = (
    vehicle: string,
    values: Float64Array,
    trip: string | undefined,
    file: string,
    at: number,
    fromFrames: boolean,
  ) => {
    rows++;
    const s = streams.get(vehicle);
    if (!s) {
      reject('unknown_vehicle');
      unknown.add(vehicle);
      return;
    }
    audit.row(file, at, vehicle, values, fromFrames);
    s.push(values, trip);
  };
  const progress = progressReporter(bytes);
  const onBytes = (n: number) => progress.bytes(n, rows);

  for (const file of files) {
    const owner = vehicleOfPath(file.path, dataPath, ids);
    const map = (owner ? ownMaps.get(owner) : undefined) ?? globalMap;
    if (file.kind === 'table')
      readCsvFile(
        file.path,
        { sample: (v, values, trip, line) => push(v, values, trip, file.path, line, false), bad },
        onBytes,
        { map, vehicle_id: owner, max_line_bytes: options.max_line_bytes },
      );
    else readFrames(file, map, owner);
    audit.endFile(file.path);
  }

  function readFrames(file: DataFile, map: DataMap | undefined, owner: string | null): void {
    const vehicle = map?.vehicle && 'id' in map.vehicle ? map.vehicle.id : owner;
    if (!vehicle)
      throw new InputError(
        [
          {
            where: file.path,
            rule: 'a candump log names no vehicle: name the file or its folder for a vehicle of the fleet file, or give vehicle.id in the mapping',
          },
        ],
        'vehicle unknown',
      );
    const config = decoderConfig(map, torque.get(vehicle) ?? null, options.map ?? 'fleet file data_map');
    const r = candumpSamples(
      file.path,
      config,
      (values) => push(vehicle, values, undefined, file.path, values[0]!, true),
      bad,
      onBytes,
    );
    const f = (frames[vehicle] ??= emptyFrameCounts());
    for (const k of Object.keys(f) as (keyof FrameCounts)[]) f[k] += r.frames[k];
    const top = r.unknown_pgns.slice(0, 5).map(([pgn, n]) => `${pgn} ×${n}`);
    log(
      `${file.path}: ${r.file.frames.toLocaleString('en-US')} frames, ${r.frames.decoded.toLocaleString('en-US')} decoded, ` +
        `${r.frames.unknown_pgn.toLocaleString('en-US')} of PGNs not read${top.length ? ` (${top.join(', ')})` : ''}, ` +
        `${r.frames.not_available} values not available, ${r.frames.error_values} error values → ${r.frames.samples.toLocaleString('en-US')} samples`,
    );
  }

  progress.end();
  audit.end();
  if (unknown.size)
    log(`rows of vehicles not in the fleet file were skipped: ${[...unknown].slice(0, 10).join(', ')}`);
  for (const s of streams.values()) {
    s.finish();
    for (const [k, n] of Object.entries(s.rejected)) by_reason[k] = (by_reason[k] ?? 0) + n;
  }
  const total = Object.values(by_reason).reduce((a, b) => a + b, 0);
  if (rows === 0)
    throw new InputError([{ where: dataPath, rule: 'no usable rows in any file' }], 'nothing to analyse');
  return {
    vehicles,
    streams,
    rejected: { total, by_reason },
    rows,
    frames,
    whyNoTrips: (vehicle) => {
      const reasons = audit.vehicleReasons(vehicle);
      const s = streams.get(vehicle);
      if (reasons.length) return `no usable samples: ${reasons.join('; ')}`;
      return s && s.received > 0 ? `${s.received} samples, but no trip in them` : 'no data for this vehicle';
    },
  };
}

const configs = new Map<DataMap | undefined, Map<number | null, DecoderConfig>>();

/** The decoder's tables for a mapping and reference torque, built once each. */
function decoderConfig(map: DataMap | undefined, torque: number | null, source: string): DecoderConfig {
  let byTorque = configs.get(map);
  if (!byTorque) configs.set(map, (byTorque = new Map()));
  let config = byTorque.get(torque);
  if (!config) {
    const r = compileFrames(map?.frames, torque);
    if (r.problems.length)
      throw new InputError(
        r.problems.map((p) => ({ ...p, where: `${source}: ${p.where}` })),
        `${source} is not valid`,
      );
    byTorque.set(torque, (config = r.config));
  }
  return config;
}
