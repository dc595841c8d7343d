import type { Problem } from '@thermargin/shared';
import { MAX_LINE_BYTES } from '@thermargin/logger-data/io/lines';

/** parseArgs options every command that reads a fleet file and its data takes. */
export const FLEET_DATA_OPTIONS = {
  fleet: { type: 'string' },
  data: { type: 'string' },
  out: { type: 'string' },
  'max-line-bytes': { type: 'string' },
  map: { type: 'string' },
} as const;

/** The usage lines of the options above that every such command shares. */
export const MAP_USAGE = `  --map     mapping file (JSON): a logger's own column names, units, time form and J1939 parameters
            (see the README, "Logger data"); a vehicle's data_map in the fleet file wins for its files`;

export const MAX_LINE_USAGE = `  --max-line-bytes N  the longest line read in a data file, table or candump log (default ${MAX_LINE_BYTES});
                      a longer one stops with exit 2`;

/** --max-line-bytes (a whole number of bytes ≥ 64; default MAX_LINE_BYTES), or a problem added. */
export function maxLineBytes(values: { 'max-line-bytes'?: string }, problems: Problem[]): number {
  const raw = values['max-line-bytes'];
  if (raw === undefined) return MAX_LINE_BYTES;
  const n = /^\d{1,12}$/.test(raw) ? Number(raw) : Number.NaN;
  if (!(n >= 64)) problems.push({ where: '--max-line-bytes', rule: 'must be a whole number of bytes ≥ 64' });
  return n;
}

/** The missing required ones of --fleet and --data, for the command to add its own checks to. */
export function fleetDataProblems(values: { fleet?: string; data?: string }): Problem[] {
  const problems: Problem[] = [];
  if (!values.fleet) problems.push({ where: '--fleet', rule: 'required' });
  if (!values.data) problems.push({ where: '--data', rule: 'required' });
  return problems;
}
