import { analyzeVehicle } from '@thermargin/core/analyze';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples } from '@thermargin/shared';
import { afterAll, describe, expect, it } from 'vitest';
import { createScenario } from '../../../services/simulator/src/scenario.ts';

/**
 * A second generator for the per-vehicle air-side fit: the demo simulator's healthy vehicles, whose
 * archetypes carry air sides other than the core's defaults (bus: ratio 0.2, fan 4.5 m/s, exponent 0.5;
 * van: 0.18, 3.5 m/s, 0.55; truck: 0.25, 5 m/s, 0.5), with their `airside` taken out of the fleet file.
 * The ram band's exponent, which every vehicle's highway driving carries, must come back.
 */
const sc = createScenario({ faults: 'none', days: 21, vehicles: 6 });
const lines: string[] = [];
afterAll(() => console.log(`air side learned on the demo simulator (truth → fit)\n${lines.join('\n')}`));

describe('air-side fit on the demo simulator', () => {
  it.each(sc.vehicles.map((v) => v.id))('%s: the ram-band exponent within ±0.05 of the archetype’s', (id) => {
    const { airside, ...config } = sc.fleet.vehicles.find((v) => v.id === id)!;
    const model = resolveVehicle(config);
    const trips = analyzeVehicle(model, columnsFromSamples([...sc.vehicleSamples(id)])).trips;
    const fit = vehicleResult(model, trips).result.airside_fit!;
    const n = fit.velocity_exponent;
    lines.push(
      `${id}: exponent ${airside!.velocity_exponent} → ${n.value} ${JSON.stringify(n.ci95)} (${n.basis}); ` +
        `fan band ${fit.fan_velocity_exponent.value} (${fit.fan_velocity_exponent.basis}); ` +
        `ratio at v_fan 4 m/s ${((airside!.ram_face_ratio! / airside!.fan_face_velocity_ms!) * 4).toFixed(3)} → ${fit.ram_face_ratio.value} (${fit.ram_face_ratio.basis})`,
    );
    expect(n.basis).toBe('fitted');
    expect(Math.abs(n.value - airside!.velocity_exponent!)).toBeLessThanOrEqual(0.05);
  });
});
