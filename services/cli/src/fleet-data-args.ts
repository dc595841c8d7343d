import type { Problem } from '@thermargin/shared';

/** parseArgs options every command that reads a fleet file and its data takes. */
export const FLEET_DATA_OPTIONS = {
  fleet: { type: 'string' },
  data: { type: 'string' },
  out: { type: 'string' },
} as const;

/** The missing required ones of --fleet and --data, for the command to add its own checks to. */
export function fleetDataProblems(values: { fleet?: string; data?: string }): Problem[] {
  const problems: Problem[] = [];
  if (!values.fleet) problems.push({ where: '--fleet', rule: 'required' });
  if (!values.data) problems.push({ where: '--data', rule: 'required' });
  return problems;
}
