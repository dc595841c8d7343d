import { describe, expect, it } from 'vitest';
import { coldLightTrip } from '../../support/forward-model/trips.ts';
import { VEHICLES } from '../../support/forward-model/vehicles.ts';
import { recover } from './harness.ts';

/**
 * A cold day (5 °C) with a light load: the thermostat starts to open but never fully, so the radiator
 * is never in charge. The estimator must say so (null k with a reason) rather than give a number.
 */
describe('cold light trip: thermostat never fully open', () => {
  const cases = VEHICLES.flatMap((vehicle) => [true, false].map((flow_meter) => ({ vehicle, flow_meter })));
  it.each(cases)('$vehicle.id, flow meter $flow_meter', ({ vehicle, flow_meter }) => {
    const r = recover({ vehicle, profile: coldLightTrip(3), seed: 11, sensors: { flow_meter } });
    const maxCoolant_c = Math.max(...r.run.trace.coolant_c);
    // Scenario check: the valve opened (the bypass mattered) but never fully.
    expect(maxCoolant_c).toBeGreaterThan(vehicle.thermostat.open_c);
    expect(maxCoolant_c).toBeLessThan(vehicle.thermostat.full_open_c);
    for (const c of [r.ram, r.fan]) {
      expect(c.true_w_m2k).toBeNull();
      expect(
        c.estimated_w_m2k,
        `${c.band}: got a number on a trip with the radiator never in charge`,
      ).toBeNull();
      expect(c.reason, `${c.band}: null k needs a reason`).toMatch(/\S/);
    }
  });
});
