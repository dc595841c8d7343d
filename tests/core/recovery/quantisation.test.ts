import { afterAll, describe, expect, it } from 'vitest';
import { HOT_TRIPS, hotMixedTrip } from '../../support/forward-model/trips.ts';
import { VEHICLES } from '../../support/forward-model/vehicles.ts';
import { ErrorTable, recover, TOLERANCE_PCT } from './harness.ts';

/**
 * Coolant temperatures quantised as SAE J1939-71 sends them: SPN 1637 at 0.03125 °C and SPN 110 at
 * 1 °C per bit. At 1 °C the radiator ΔT of a few kelvin is too coarse for a coolant-side energy
 * balance (common practice); the estimator must then still be
 * within tolerance or decline with a reason, never report a wrong number.
 */
const table = new ErrorTable('k recovery, quantised coolant temperatures');
afterAll(() => table.print());

const cases = VEHICLES.flatMap((vehicle) =>
  [0.03125, 1].flatMap((quantum_c) =>
    [true, false].map((flow_meter) => ({ vehicle, quantum_c, flow_meter })),
  ),
);

describe('quantised coolant temperatures', () => {
  it.each(cases)(
    '$vehicle.id, $quantum_c °C/bit, flow meter $flow_meter',
    ({ vehicle, quantum_c, flow_meter }) => {
      const r = recover({
        vehicle,
        profile: hotMixedTrip(HOT_TRIPS[vehicle.id]!),
        seed: 7,
        sensors: { flow_meter, coolant_quantum_c: quantum_c },
      });
      for (const c of [r.ram, r.fan]) {
        const line = table.add(
          `${vehicle.id} ${quantum_c} °C/bit flow meter ${flow_meter ? 'on ' : 'off'}`,
          c,
        );
        if (c.estimated_w_m2k === null) {
          expect(quantum_c, `declined at fine resolution: ${line}`).toBe(1);
          expect(c.reason, line).toMatch(/\S/);
        } else {
          expect(Math.abs(c.error_pct), line).toBeLessThanOrEqual(TOLERANCE_PCT[c.band]);
        }
      }
    },
  );
});
