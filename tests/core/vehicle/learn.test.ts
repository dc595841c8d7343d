import { analyzeVehicle } from '@thermargin/core/analyze';
import { windowK_w_m2k } from '@thermargin/core/trip/refer';
import { learnVehicle, storedReferral } from '@thermargin/core/vehicle/learn';
import { vehicleResult } from '@thermargin/core/vehicle-result';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type TripResult, withoutWindows } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { drawHistory } from '../../support/forward-model/history.ts';
import { runScenario } from '../../support/forward-model/scenario.ts';
import { pilotMeanLoad } from '../recovery/history-suite.ts';

/** A bus history of 14 trips with an ambient sensor reading 1.2 K low, through the trip stage. */
function history() {
  const h = drawHistory(31, 0, pilotMeanLoad, { trips: 14 });
  for (const t of h.trips) t.sensors = { ...t.sensors, ambient_offset_k: -1.2 };
  const model = resolveVehicle(h.fleet);
  const trips = analyzeVehicle(
    model,
    columnsFromSamples(h.trips.flatMap((s) => runScenario(s).samples)),
  ).trips;
  return { model, trips };
}

describe('the vehicle stage', () => {
  const { model, trips } = history();
  const learned = learnVehicle(model, trips);

  it('is a function of the set of trips: again on its own output, or in another order, the same', () => {
    expect(learnVehicle(model, learned.trips).trips).toEqual(learned.trips);
    // Given the learned vehicle (a caller that passes it on), it learns from the fleet file's model.
    expect(learnVehicle(learned.vehicle, learned.trips).trips).toEqual(learned.trips);
    const shuffled = [...trips].reverse();
    const byId = (ts: readonly TripResult[]) => new Map(ts.map((t) => [t.trip, t]));
    expect(byId(learnVehicle(model, shuffled).trips)).toEqual(byId(learned.trips));
  });

  it('a stored result plus a trip arriving late gives what all trips at once give (the analyzer)', () => {
    // The stored result's trips carry their own margins aside (health/trip-margins.ts); the late trip
    // moves what the vehicle stage learns, so every kept trip's figures must be made again.
    const late = trips[6]!;
    const stored = vehicleResult(
      model,
      trips.filter((t) => t !== late),
    ).result.trips;
    const again = vehicleResult(model, [...stored.slice(0, 6), late, ...stored.slice(6)]).result;
    expect(again.trips).toEqual(vehicleResult(model, trips).result.trips);
  });

  it('confirms the ambient offset from the soak checks, corrects the trips and keeps the uncorrected figures', () => {
    const period = learned.ambient[0]!;
    expect(period.applied).toBe(true);
    // The ambient reads 1.2 K low, so a soaked loop reads 1.2 K above it.
    expect(period.value_k!).toBeGreaterThan(0.9);
    expect(period.value_k!).toBeLessThan(1.5);
    const t = learned.trips.find((x) => x.k_ram_w_m2k !== null)!;
    expect(t.ambient_correction_k).toBe(period.value_k);
    expect(t.uncorrected!.k_ram_w_m2k!).toBeLessThan(t.k_ram_w_m2k!);
  });

  it('rebuilds from a stored result the referral each trip was made with (the API trace)', () => {
    const r = vehicleResult(model, trips).result;
    for (const t of r.trips.slice(0, 4)) {
      const stored = storedReferral(model, JSON.parse(JSON.stringify(r)), t);
      const k = windowK_w_m2k('ram', t.windows!.ram, model.radiator_area_m2, stored);
      const mine = windowK_w_m2k('ram', t.windows!.ram, model.radiator_area_m2, {
        airside: learned.vehicle.airside,
        unmeasured_heat_kw: learned.vehicle.aux_heat_kw,
        ambient_correction_k: t.ambient_correction_k ?? 0,
      });
      expect(Array.from(k)).toEqual(Array.from(mine));
    }
  });

  it('passes trips without windows (results kept from before) unchanged', () => {
    const old = trips.map(withoutWindows);
    expect(learnVehicle(model, old).trips).toEqual(old);
    expect(learnVehicle(model, old).airside.notes.length).toBeGreaterThan(0);
  });

  it('reports what it learned in the result contract', () => {
    const r = vehicleResult(model, trips).result;
    expect(r.airside_fit!.trips).toBe(14);
    expect(r.unmeasured_heat!.basis).toMatch(/fitted|none/);
    expect(r.ambient_offset![0]!.from).toBeNull();
  });
});
