import { type DataMap, type FleetInput, InputError } from '@thermargin/shared';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import { loadFleetFile } from '@thermargin/usecases/fleet-file';
import { candumpSamples } from '@thermargin/logger-data/io/candump-samples';
import { readDataMap, vehicleDataMaps } from '@thermargin/logger-data/io/data-maps';
import { type DecoderConfig, frameTables } from '@thermargin/logger-data/j1939/config';
import { emptyFrameCounts, type FrameCounts } from '@thermargin/logger-data/j1939/decoder';
import { readCsvFile } from './csv-reader.ts';
import { type DataFile, vehicleOfPath } from './data-files.ts';
import { type FileNotes, RowAudit } from './row-audit.ts';
import { VehicleStream } from './vehicle-stream.ts';

/** Everything a reader needs to know before the first file: the fleet, the mappings, where the data is. */
export interface ReadContext {
  fleet: FleetInput;
  models: VehicleModel[];
  byId: Map<string, VehicleModel>;
  /** The --map file's mapping, for files whose vehicle has none of its own. */
  globalMap: DataMap | undefined;
  /** Each vehicle's own mapping (the fleet file's data_map). */
  ownMaps: Map<string, DataMap>;
  dataPath: string;
  mapPath: string | undefined;
  /** bytes: the longest line read (--max-line-bytes); the reader's default when undefined. */
  max_line_bytes: number | undefined;
}

/** The fleet file, its vehicles' mappings (inline or files relative to it) and the --map file. */
export function loadContext(
  fleetPath: string,
  dataPath: string,
  mapPath: string | undefined,
  max_line_bytes?: number,
): ReadContext {
  const { input: fleet, models: byId } = loadFleetFile(fleetPath);
  const ownMaps = vehicleDataMaps(fleet, fleetPath);
  return {
    fleet,
    models: [...byId.values()],
    byId,
    globalMap: mapPath ? readDataMap(mapPath) : undefined,
    ownMaps,
    dataPath,
    mapPath,
    max_line_bytes,
  };
}

/** What a vehicle's stream left once finished: all a report needs, and all that crosses threads. */
export interface StreamOutcome {
  trips: VehicleStream['trips'];
  rejected: Record<string, number>;
  dropped: Record<string, number>;
  received: number;
}

export interface ReaderOptions {
  /** Only these vehicles' rows are kept (the rest pass unseen and uncounted); all when absent. */
  only?: ReadonlySet<string>;
  /** Observer per vehicle of each analysed piece (see VehicleStream). */
  observe?: (v: VehicleModel) => ConstructorParameters<typeof VehicleStream>[1];
  onBytes?: (n: number) => void;
}

/**
 * Reads data files one after another into per-vehicle streams: tables (the import format, or through a
 * mapping) and candump logs (J1939 frames decoded and resampled). Counts what it refuses, tells it per
 * file (RowAudit), and notes which files each vehicle's rows came from.
 */
export class DataReader {
  readonly streams = new Map<string, VehicleStream>();
  readonly by_reason: Record<string, number> = {};
  readonly unknown = new Set<string>();
  readonly frames: Record<string, FrameCounts> = {};
  readonly audit = new RowAudit();
  /** Per vehicle, the indices of the files its rows came from. */
  readonly filesOf = new Map<string, number[]>();
  rows = 0;
  private readonly ids: string[];
  private readonly tables = frameTables();

  constructor(
    private readonly ctx: ReadContext,
    private readonly o: ReaderOptions = {},
  ) {
    this.ids = ctx.models.map((m) => m.id);
    // An observer expects to hear of every vehicle, as the sizing does of the vehicles it sizes.
    if (o.observe) for (const m of ctx.models) this.streams.set(m.id, new VehicleStream(m, o.observe(m)));
  }

  private reject(reason: string): void {
    this.by_reason[reason] = (this.by_reason[reason] ?? 0) + 1;
  }

  private stream(vehicle: string, index: number): VehicleStream | undefined {
    let s = this.streams.get(vehicle);
    if (!s) {
      const model = this.ctx.byId.get(vehicle);
      if (!model) return undefined;
      this.streams.set(vehicle, (s = new VehicleStream(model, this.o.observe?.(model))));
    }
    const files = this.filesOf.get(vehicle);
    if (!files) this.filesOf.set(vehicle, [index]);
    else if (files.at(-1) !== index) files.push(index);
    return s;
  }

  /** Reads one file (its index in the whole list); returns what it gave to say. */
  read(file: DataFile, index: number): FileNotes {
    const owner = vehicleOfPath(file.path, this.ctx.dataPath, this.ids);
    const map = (owner ? this.ctx.ownMaps.get(owner) : undefined) ?? this.ctx.globalMap;
    const only = this.o.only;
    const bad = (where: string, reason: string) => {
      if (only) return; // a second reading for some vehicles: the first told and counted these
      this.reject(reason);
      this.audit.bad(where, reason);
    };
    let last = '';
    let current: VehicleStream | undefined;
    const push = (
      vehicle: string,
      values: Float64Array,
      trip: string | undefined,
      at: number,
      frames: boolean,
    ) => {
      if (only && !only.has(vehicle)) return;
      this.rows++;
      if (vehicle !== last) {
        last = vehicle;
        current = this.stream(vehicle, index);
      }
      if (!current) {
        this.reject('unknown_vehicle');
        this.unknown.add(vehicle);
        return;
      }
      this.audit.row(file.path, at, vehicle, values, frames);
      current.push(values, trip);
    };
    if (file.kind === 'table')
      readCsvFile(
        file.path,
        { sample: (v, values, trip, line) => push(v, values, trip, line, false), bad },
        this.o.onBytes,
        { map, vehicle_id: owner, max_line_bytes: this.ctx.max_line_bytes },
      );
    else {
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
      const r = candumpSamples(
        file.path,
        this.decoderConfig(map, vehicle),
        (values) => push(vehicle, values, undefined, values[0]!, true),
        bad,
        this.o.onBytes,
        this.ctx.max_line_bytes,
      );
      const f = (this.frames[vehicle] ??= emptyFrameCounts());
      for (const k of Object.keys(f) as (keyof FrameCounts)[]) f[k] += r.frames[k];
      const top = r.unknown_pgns.slice(0, 5).map(([pgn, n]) => `${pgn} ×${n}`);
      const n = (x: number) => x.toLocaleString('en-US');
      this.audit.note(
        `${file.path}: ${n(r.file.frames)} frames: ${n(r.frames.decoded)} decoded, ` +
          `${n(r.frames.unknown_pgn)} of unknown PGNs${top.length ? ` (${top.join(', ')})` : ''}, ` +
          `${n(r.frames.not_available)} values not available, ${n(r.frames.error_values)} error values → ${n(r.frames.samples)} samples`,
      );
    }
    return this.audit.endFile(file.path);
  }

  /** Finishes every stream; their outcomes by vehicle. */
  finish(): Map<string, StreamOutcome> {
    const out = new Map<string, StreamOutcome>();
    for (const [id, s] of this.streams) {
      s.finish();
      out.set(id, { trips: s.trips, rejected: s.rejected, dropped: s.dropped, received: s.received });
    }
    return out;
  }

  /** The decoder's tables for a mapping and the vehicle's reference torque, built once each. */
  private decoderConfig(map: DataMap | undefined, vehicle: string): DecoderConfig {
    const torque = this.ctx.fleet.vehicles.find((v) => v.id === vehicle)?.engine_reference_torque_nm ?? null;
    const { config, problems } = this.tables(map?.frames, torque);
    if (problems.length) {
      const source =
        map === this.ctx.globalMap && this.ctx.mapPath ? this.ctx.mapPath : `${vehicle}'s data_map`;
      throw new InputError(
        problems.map((p) => ({ ...p, where: `${source}: ${p.where}` })),
        `${source} is not valid`,
      );
    }
    return config;
  }
}
