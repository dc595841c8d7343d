import type { ApiContext } from './context.ts';
import type { Handlers } from './route.ts';

/** What intake took from the vehicles' CAN frames (the Intake screen's frames table). */
export function intakeRoutes(x: ApiContext): Handlers<'intakeFrames'> {
  return { intakeFrames: async () => ({ vehicles: await x.deps.samples.frameTotals() }) };
}
