import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { type DataMap, type FleetInput, InputError, parseDataMapText } from '@thermargin/shared';

/** A mapping file, read and validated (errors name the file and the line or field). */
export function readDataMap(path: string): DataMap {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new InputError([{ where: path, rule: 'cannot read the mapping file' }], 'mapping file not found');
  }
  return parseDataMapText(text, path);
}

/** Each vehicle's own mapping from the fleet file: inline, or a file named relative to the fleet file. */
export function vehicleDataMaps(fleet: FleetInput, fleetPath: string): Map<string, DataMap> {
  const out = new Map<string, DataMap>();
  for (const v of fleet.vehicles)
    if (v.data_map !== undefined)
      out.set(
        v.id,
        typeof v.data_map === 'string' ? readDataMap(resolve(dirname(fleetPath), v.data_map)) : v.data_map,
      );
  return out;
}
