import { createSqliteStore } from '@thermargin/store';
import { describe, expect, it } from 'vitest';
import { tripResult } from './results-contract.ts';

const trip = tripResult;

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
