import { type TripResult, tripResultSchema } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import { describe, expect, it } from 'vitest';

const trip = (id: string, start: string, k: number | null): TripResult =>
  tripResultSchema.parse({
    trip: id,
    start,
    end: start,
    samples: 10,
    rejected: 0,
    distance_km: 1,
    k_ram_w_m2k: k,
    k_ram_ci95: null,
    n_ram: 0,
    k_ram_reason: k === null ? 'no ram-band windows' : null,
    k_fan_w_m2k: null,
    k_fan_ci95: null,
    n_fan: 0,
    k_fan_reason: 'no fan-band windows',
    heat_kw_mean: 50,
    heat_kw_p95: 80,
    heat_kw_max: 90,
    heat_kwh: 10,
    derate_s: 0,
    coolant_max_c: 80,
    ambient_max_c: 30,
    margin_pct: null,
    limiting_ambient_c: null,
    margin_basis: null,
    ambient_mean_c: 25,
    soak_offset_k: null,
    fan_saturated_share: 0,
    coolant_dt_per_kw: null,
    sensor_flags: [],
  });

describe('SQLite ResultsStore', () => {
  it('replaces trip results by vehicle + trip, reads them by start, and joins them to the vehicle summary', async () => {
    const store = createSqliteStore({ path: ':memory:' });
    await store.putTripResults('bus-01', [
      trip('t2', '2025-07-02T06:00:00Z', 40),
      trip('t1', '2025-07-01T06:00:00Z', 41),
    ]);
    await store.putTripResults('bus-01', [trip('t2', '2025-07-02T06:00:00Z', 39)]);
    expect((await store.readTripResults('bus-01')).map((t) => [t.trip, t.k_ram_w_m2k])).toEqual([
      ['t1', 41],
      ['t2', 39],
    ]);
    await store.putVehicleResult({
      id: 'bus-01',
      trips: [],
      status: 'watch',
      health: { ram: 0.9, fan: null },
    });
    const v = await store.readVehicleResult('bus-01');
    expect(v?.status).toBe('watch');
    expect(v?.trips.map((t) => t.trip)).toEqual(['t1', 't2']);
    expect(await store.readVehicleResult('nobody')).toBeUndefined();
    expect((await store.readVehicleResults()).map((r) => r.id)).toEqual(['bus-01']);
    await store.close();
  });
});
