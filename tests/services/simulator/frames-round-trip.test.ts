import { columnsFromSamples, ColumnBuilder, type FleetInput, type Sample } from '@thermargin/shared';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { compileFrames } from '@thermargin/logger-data/j1939/config';
import { FrameDecoder } from '@thermargin/logger-data/j1939/decoder';
import { describe, expect, it } from 'vitest';
import { framesFleet, sendsEngineFrames, vehicleFrames } from '../../../services/simulator/src/frames.ts';
import { createScenario } from '../../../services/simulator/src/scenario.ts';

/** The vehicle's samples rebuilt from its J1939 frames, as the import and the ingester decode them. */
function throughFrames(fleet: FleetInput, id: string, samples: Iterable<Sample>) {
  const v = fleet.vehicles.find((x) => x.id === id)!;
  const map = typeof v.data_map === 'object' ? v.data_map : undefined;
  const { config } = compileFrames(map?.frames, v.engine_reference_torque_nm ?? null);
  const out = new ColumnBuilder();
  const decoder = new FrameDecoder(config, (values) => out.push(values, undefined));
  for (const f of vehicleFrames(samples, sendsEngineFrames(v)))
    decoder.frame(f.time_us, f.id, f.data.length, f.data, 0);
  decoder.finish();
  return { columns: out.view(), counts: decoder.counts };
}

describe('the simulator’s trips as J1939 frames and as samples give the same result', () => {
  for (const seed of [3, 11]) {
    it(`per-trip k within 0.5 % and the same status (seed ${seed}, random fleet variant)`, () => {
      const sc = createScenario({ seed, vehicles: 6, days: 2 });
      const fleet = framesFleet(sc.fleet);
      const models = resolveFleet(fleet);
      for (const model of models) {
        const samples = [...sc.vehicleSamples(model.id)];
        const direct = analyzeVehicle(model, columnsFromSamples(samples));
        const { columns, counts } = throughFrames(fleet, model.id, samples);
        expect(counts).toMatchObject({ dlc_mismatch: 0, unknown_pgn: 0, error_values: 0, bam_broken: 0 });
        expect(columns.n).toBe(samples.length);
        const framed = analyzeVehicle(model, columns);
        expect(framed.trips.map((t) => t.start)).toEqual(direct.trips.map((t) => t.start));
        direct.trips.forEach((t, i) => {
          const u = framed.trips[i]!;
          for (const k of ['k_ram_w_m2k', 'k_fan_w_m2k'] as const) {
            expect(u[k] === null).toBe(t[k] === null);
            if (t[k] !== null) expect(Math.abs(u[k]! / t[k] - 1)).toBeLessThan(0.005);
          }
        });
        expect(vehicleResult(model, framed.trips).result.status).toBe(
          vehicleResult(model, direct.trips).result.status,
        );
      }
    });
  }

  it('power from engine speed and torque matches within the torque resolution (1 % of reference torque)', () => {
    const sc = createScenario({ seed: 5, vehicles: 6, days: 1 });
    const fleet = framesFleet(sc.fleet);
    const truck = fleet.vehicles.find((v) => sendsEngineFrames(v))!;
    const samples = [...sc.vehicleSamples(truck.id)];
    const { columns } = throughFrames(fleet, truck.id, samples);
    samples.forEach((s, i) => {
      // ±0.5 % of T_ref · ω at the engine speed used, ≤ 2600 N·m × 2400 rpm × π/30 / 200 = 3.3 kW.
      expect(Math.abs(columns.power_kw[i]! - s.power_kw)).toBeLessThan(3.3);
      expect(columns.coolant_in_c[i]).toBe(s.coolant_in_c);
    });
  });
});
