import { readFileSync } from 'node:fs';
import { type FleetInput, InputError, parseFleetText } from '@thermargin/shared';
import { resolveFleet, type VehicleModel } from '@thermargin/core/vehicle/resolve';

export interface LoadedFleet {
  input: FleetInput;
  models: Map<string, VehicleModel>;
}

/** The fleet from its text: validated (errors name the field), resolved, keyed by vehicle id. */
export function fleetFromText(text: string, source: string): LoadedFleet {
  const input = parseFleetText(text, source);
  return { input, models: new Map(resolveFleet(input).map((m) => [m.id, m])) };
}

export function loadFleetFile(path: string): LoadedFleet {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new InputError([{ where: path, rule: 'cannot read the fleet file' }], 'fleet file not found');
  }
  return fleetFromText(text, path);
}
