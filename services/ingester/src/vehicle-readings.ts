import type { DataMap, FleetInput } from '@thermargin/shared';
import { vehicleDataMaps } from '@thermargin/logger-data/io/data-maps';
import { compileFrames, type DecoderConfig, frameTables } from '@thermargin/logger-data/j1939/config';
import { recordMapper } from '@thermargin/logger-data/record';

/** A vehicle's mapping and reference torque as the fleet file gives them (plain data: it crosses threads). */
export interface VehicleMapSpec {
  map?: DataMap | undefined;
  reference_torque_nm: number | null;
}

/** Each vehicle's spec from the fleet file read from `fleetPath` (mapping files are named relative to it). */
export function vehicleMapSpecs(fleet: FleetInput, fleetPath: string): Map<string, VehicleMapSpec> {
  const maps = vehicleDataMaps(fleet, fleetPath);
  return new Map(
    fleet.vehicles.map((v) => [
      v.id,
      { map: maps.get(v.id), reference_torque_nm: v.engine_reference_torque_nm ?? null },
    ]),
  );
}

/** How the ingester reads a vehicle's messages: its frames' decoder tables, its JSON field mapping. */
export interface VehicleReading {
  frames: DecoderConfig;
  /** Turns a logger's own JSON record into a wire sample; absent: the wire format as it is. */
  record?: (item: unknown, vehicle: string) => unknown;
}

/** The reading of a vehicle without a mapping: the standard J1939 parameters, the wire format's JSON. */
export const STANDARD_READING: VehicleReading = { frames: compileFrames(undefined).config };

/**
 * Each vehicle's reading from its spec; throws naming the vehicle and field when a mapping cannot be used.
 * Vehicles with the same frames section and reference torque share one decoder table (½ MB each).
 */
export function vehicleReadings(specs: Iterable<[string, VehicleMapSpec]>): Map<string, VehicleReading> {
  const out = new Map<string, VehicleReading>();
  const tables = frameTables();
  for (const [vehicle, spec] of specs) {
    if (!spec.map && spec.reference_torque_nm === null) continue;
    const { config, problems } = tables(spec.map?.frames, spec.reference_torque_nm);
    if (problems.length)
      throw new Error(
        `ingester: vehicle ${vehicle}'s data_map: ${problems.map((p) => `${p.where}: ${p.rule}`).join('; ')}`,
      );
    const json = spec.map && (spec.map.fields || spec.map.time || spec.map.vehicle || spec.map.trip);
    out.set(vehicle, { frames: config, ...(json ? { record: recordMapper(spec.map!) } : {}) });
  }
  return out;
}
