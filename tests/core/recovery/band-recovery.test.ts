import { afterAll, describe, expect, it } from 'vitest';
import { HOT_TRIPS, hotMixedTrip } from '../../support/forward-model/trips.ts';
import { VEHICLES } from '../../support/forward-model/vehicles.ts';
import { ErrorTable, recover, TOLERANCE_PCT } from './harness.ts';

/**
 * Recovery of in-service k from a hot mixed trip for three vehicles, with and without a coolant flow
 * meter, three seeds each. Truth: the forward model's own k = Q/(A·ITD) at the band's reference air
 * condition (harness.ts). Tolerances are the targets (±3 % ram, ±5 % fan).
 */
const table = new ErrorTable('k recovery, hot mixed trip (vehicle × flow meter × seed)');
afterAll(() => table.print());

const cases = VEHICLES.flatMap((vehicle) =>
  [true, false].flatMap((flow_meter) => [1, 2, 3].map((seed) => ({ vehicle, flow_meter, seed }))),
);

describe('band k recovery on a hot mixed trip', () => {
  it.each(cases)('$vehicle.id, flow meter $flow_meter, seed $seed', ({ vehicle, flow_meter, seed }) => {
    const r = recover({
      vehicle,
      profile: hotMixedTrip(HOT_TRIPS[vehicle.id]!),
      seed,
      sensors: { flow_meter },
    });
    const label = `${vehicle.id} flow meter ${flow_meter ? 'on ' : 'off'} seed ${seed}`;
    for (const c of [r.ram, r.fan]) {
      const line = table.add(label, c);
      // The scenario itself must give the band a fair chance: ≥ 5 min with the radiator in charge.
      expect(c.truth_s, `scenario: ${line}`).toBeGreaterThanOrEqual(300);
      expect(c.estimated_w_m2k, line).not.toBeNull();
      expect(Math.abs(c.error_pct), line).toBeLessThanOrEqual(TOLERANCE_PCT[c.band]);
    }
  });
});
