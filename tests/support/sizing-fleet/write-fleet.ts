import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fleetEntry, generateVehicle, type SizingVehicleSpec, toCsv } from './generate.ts';

/** Writes fleet.json and one CSV per vehicle into `dir`; returns their paths. */
export function writeSizingFleet(
  dir: string,
  specs: readonly SizingVehicleSpec[],
): { fleet: string; data: string } {
  const fleet = join(dir, 'fleet.json');
  writeFileSync(fleet, JSON.stringify({ vehicles: specs.map(fleetEntry) }, null, 1));
  for (const s of specs) writeFileSync(join(dir, `${s.id}.csv`), toCsv(s.id, generateVehicle(s).columns));
  return { fleet, data: dir };
}
