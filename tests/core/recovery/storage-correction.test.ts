import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples } from '@thermargin/shared';
import { afterAll, describe, expect, it } from 'vitest';
import { stopAndGoTrip } from '../../support/forward-model/trips.ts';
import { windowStorageBias } from '../../support/forward-model/truth.ts';
import { FUEL_CELL_BUS, VEHICLES } from '../../support/forward-model/vehicles.ts';
import { ErrorTable, recover, TOLERANCE_PCT } from './harness.ts';

/**
 * Transient-heavy trips: climbing stop-and-go traffic, no flow meter, so the heat rejected is
 * heat generated − C·dT/dt. The loop's heat storage is large next to the heat flows here.
 */
const table = new ErrorTable('k recovery, stop-and-go (heat balance, no flow meter unless stated)');
afterAll(() => table.print());

/** Long go/stop phases: each 60-s window is far from steady. */
const SLOW_WAVES = { grade: 0.07, aux_kw: 40, go_s: [60, 180], stop_s: [30, 90], duration_s: 3000 } as const;
/** Short, rapid go/stop cycles, per vehicle. */
const RAPID: Record<string, { grade: number; aux_kw: number }> = {
  'fc-bus-01': { grade: 0.07, aux_kw: 40 },
  'ev-van-01': { grade: 0.12, aux_kw: 10 },
  'dx-truck-01': { grade: 0.06, aux_kw: 60 },
};

describe('storage correction in stop-and-go', () => {
  it.each([1, 2, 3])(
    'bus, slow waves, seed %i: ignoring C would bias k; the estimator is within tolerance',
    (seed) => {
      const profile = stopAndGoTrip({
        ...SLOW_WAVES,
        go_s: [...SLOW_WAVES.go_s],
        stop_s: [...SLOW_WAVES.stop_s],
      });
      const r = recover({ vehicle: FUEL_CELL_BUS, profile, seed, sensors: { flow_meter: false } });
      // Scenario check from the model's own data: a median of 60-s windows that took Q = heat generated.
      const bias_pct = windowStorageBias(FUEL_CELL_BUS, r.run.trace, 'fan', 60) * 100;
      const line = table.add(
        `bus slow waves seed ${seed} (ignoring C: ${bias_pct.toFixed(1)} % from the model)`,
        r.fan,
      );
      expect(bias_pct, `storage would bias a windowed k by only ${bias_pct.toFixed(1)} %`).toBeGreaterThan(
        TOLERANCE_PCT.fan,
      );
      expect(r.fan.estimated_w_m2k, line).not.toBeNull();
      expect(Math.abs(r.fan.error_pct), line).toBeLessThanOrEqual(TOLERANCE_PCT.fan);
      // The estimator's own storage term is what brings it in: with C ≈ 0 in the fleet file it does worse.
      const noStorage = analyzeVehicle(
        resolveVehicle({ ...r.run.config, thermal_mass_kj_per_k: 1e-3 }),
        columnsFromSamples(r.run.samples),
      ).trips[0]!;
      const noStorageErr_pct = ((noStorage.k_fan_w_m2k! - r.fan.true_w_m2k!) / r.fan.true_w_m2k!) * 100;
      table.add(`bus slow waves seed ${seed} with C ≈ 0 in the fleet file`, {
        ...r.fan,
        estimated_w_m2k: noStorage.k_fan_w_m2k,
        error_pct: noStorageErr_pct,
      });
      expect(Math.abs(noStorageErr_pct), line).toBeGreaterThan(Math.abs(r.fan.error_pct));
    },
  );

  const rapid = VEHICLES.flatMap((vehicle) => [false, true].map((flow_meter) => ({ vehicle, flow_meter })));
  it.each(rapid)(
    'rapid stop-and-go, $vehicle.id, flow meter $flow_meter: fan band within tolerance',
    ({ vehicle, flow_meter }) => {
      const profile = stopAndGoTrip({
        ...RAPID[vehicle.id]!,
        go_s: [15, 45],
        stop_s: [15, 45],
        duration_s: 4200,
      });
      const r = recover({ vehicle, profile, seed: 1, sensors: { flow_meter } });
      const line = table.add(
        `${vehicle.id} rapid stop-and-go flow meter ${flow_meter ? 'on ' : 'off'}`,
        r.fan,
      );
      expect(r.fan.truth_s, `scenario: ${line}`).toBeGreaterThanOrEqual(300);
      expect(r.fan.estimated_w_m2k, line).not.toBeNull();
      expect(Math.abs(r.fan.error_pct), line).toBeLessThanOrEqual(TOLERANCE_PCT.fan);
    },
  );
});
