import {
  type TripResult,
  tripResultSchema,
  type VehicleResult,
  vehicleResultSchema,
} from '@thermargin/shared';
import type { AnalysisCommit } from '@thermargin/store/analysis';
import type { ResultsBackend } from '@thermargin/store/results-backend';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

/** A fresh, empty results database; `connect` opens one more connection (a process role) to it. */
export interface ResultsDatabase {
  connect(): Promise<ResultsBackend>;
  /** Connections of one process can hold transactions at the same time (SQLite's block the thread: its
   *  writers are separate processes waiting in busy_timeout). */
  concurrent: boolean;
}

export const tripResult = (id: string, start: string, k: number | null): TripResult =>
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

const summary = (id: string, extra: Partial<VehicleResult> = {}): VehicleResult => ({
  id,
  trips: [],
  status: 'ok',
  health: { ram: 1, fan: null },
  ...extra,
});

const commitOf = (
  vehicle: string,
  trips: TripResult[],
  extra: Partial<AnalysisCommit> = {},
): AnalysisCommit => ({
  vehicle,
  trips,
  result: summary(vehicle, { trips }),
  analysis: {
    analysed_to_ms: 1000,
    previous_end_ms: null,
    last_trip: null,
    rejected: { range: 1 },
    assessment: { series: [1, 2], notes: ['n'] },
  },
  now_ms: 5000,
  ...extra,
});

/**
 * The one contract every results adapter passes (results, analysis state, workflow records), run on
 * SQLite and on a real PostgreSQL. `open` gives an empty database.
 */
export function resultsContract(name: string, open: () => Promise<ResultsDatabase>): void {
  describe(`results contract: ${name}`, () => {
    let database: ResultsDatabase;
    let r: ResultsBackend;
    const opened: ResultsBackend[] = [];
    const connect = async () => {
      const b = await database.connect();
      opened.push(b);
      return b;
    };
    beforeEach(async () => {
      database = await open();
      r = await connect();
    });
    afterEach(async () => {
      for (const b of opened.splice(0)) await b.close();
    });

    it('replaces trip results by vehicle + trip and reads them by start, then trip id by code point', async () => {
      const a = r.analysis;
      await a.putTripResults('bus-01', [
        tripResult('t2', '2025-07-02T06:00:00Z', 40),
        tripResult('t1', '2025-07-01T06:00:00Z', 41),
        tripResult('b', '2025-07-03T06:00:00Z', 1),
        tripResult('B', '2025-07-03T06:00:00Z', 2),
      ]);
      await a.putTripResults('bus-01', [tripResult('t2', '2025-07-02T06:00:00Z', 39)]);
      expect((await a.readTripResults('bus-01')).map((t) => [t.trip, t.k_ram_w_m2k])).toEqual([
        ['t1', 41],
        ['t2', 39],
        ['B', 2],
        ['b', 1],
      ]);
      expect(await a.readTripResults('nobody')).toEqual([]);
    });

    it('joins summaries to their trips, sorted by vehicle id by code point, and reads numbers back exactly', async () => {
      const a = r.analysis;
      const odd = {
        ...tripResult('t1', '2025-07-01T06:00:00Z', 0.1 + 0.2),
        heat_kwh: 1e-7,
        heat_kw_max: 1.5e300,
      };
      await a.putTripResults('b-2', [odd]);
      await a.putVehicleResult(
        summary('b-2', { status: 'watch', cause_hint: 'fouling — « air » ☀' } as never),
      );
      await a.putVehicleResult(summary('B-1'));
      const v = await a.readVehicleResult('b-2');
      expect(v?.trips).toEqual([odd]);
      expect(Object.is(v?.trips[0]?.k_ram_w_m2k, 0.1 + 0.2)).toBe(true);
      expect((v as unknown as { cause_hint: string }).cause_hint).toBe('fouling — « air » ☀');
      expect(await a.readVehicleResult('nobody')).toBeUndefined();
      const all = await a.readVehicleResults();
      expect(all.map((x) => [x.id, x.trips.length])).toEqual([
        ['B-1', 0],
        ['b-2', 1],
      ]);
    });

    it("keeps the learned air side and each trip's window evidence through a commit, exactly", async () => {
      const band = (speed: number) => ({
        speed_kmh: [speed, speed + 0.1],
        fan_pct: [0, 12.5],
        itd_k: [41.2, 1 / 3],
        balance_kw: [52.7, null],
        meter_kw: [null, 49.9],
        flow_lpm: [null, 180.25],
      });
      const trip = tripResultSchema.parse({
        ...tripResult('t1', '2025-07-01T06:00:00Z', 41.3),
        windows: { ram: band(72), fan: band(8) },
        ambient_correction_k: -0.7,
        uncorrected: { k_ram_w_m2k: 40.9, k_fan_w_m2k: null, margin_pct: 12.1, limiting_ambient_c: null },
      });
      const figure = (value: number, basis: 'fitted' | 'fleet_file' | 'default') => ({
        value,
        ci95: basis === 'fitted' ? ([value - 0.1, value + 0.1] as [number, number]) : null,
        basis,
      });
      const learned = vehicleResultSchema.parse({
        ...summary('v', { trips: [trip] }),
        airside_fit: {
          velocity_exponent: figure(0.47, 'fitted'),
          fan_velocity_exponent: figure(0.6, 'fleet_file'),
          ram_face_ratio: figure(0.31, 'fitted'),
          fan_face_velocity_ms: figure(4, 'default'),
          windows: 212,
          trips: 18,
          notes: ['fan exponent: too few fan-band windows'],
        },
        unmeasured_heat: { value_kw: 3.2, ci95: [1.9, 4.5], basis: 'fitted', trips: 6, reason: null },
        ambient_offset: [
          { from: null, value_k: -0.7, ci95: [-1.1, -0.3], checks: 9, applied: true, reason: null },
          { from: '2025-06-01', value_k: null, ci95: null, checks: 1, applied: false, reason: 'one check' },
        ],
      });
      await r.analysis.commit({ ...commitOf('v', [trip]), result: learned });
      expect(await r.analysis.readVehicleResult('v')).toEqual(learned);
      expect((await r.analysis.readVehicleResults())[0]).toEqual(learned);
      expect(await r.analysis.readTripResults('v')).toEqual([trip]);
      const unassessed = summary('u', { status: undefined, unassessed: 'no usable samples' });
      await r.analysis.putVehicleResult(unassessed);
      expect((await r.analysis.readVehicleResult('u'))?.unassessed).toBe('no usable samples');
    });

    it('commits results, summary and watermark together; every commit bumps the version', async () => {
      const a = r.analysis;
      const t1 = tripResult('t1', '2025-07-01T06:00:00Z', 41);
      const t2 = tripResult('t2', '2025-07-02T06:00:00Z', 40);
      await a.commit(commitOf('v', [t1, t2]));
      expect(await a.readAnalysis('v')).toEqual({
        vehicle: 'v',
        analysed_to_ms: 1000,
        previous_end_ms: null,
        last_trip: null,
        rejected: { range: 1 },
        assessment: { series: [1, 2], notes: ['n'] },
        version: 1,
        updated_ms: 5000,
      });
      expect((await a.readVehicleResult('v'))?.trips).toEqual([t1, t2]);
      // A re-analysis from 2 July on drops the trips from then before writing its own.
      const t3 = tripResult('t3', '2025-07-03T06:00:00Z', 39);
      await a.commit(
        commitOf('v', [t3], { delete_from_ms: Date.parse('2025-07-02T00:00:00Z'), now_ms: 6000.4 }),
      );
      expect((await a.readTripResults('v')).map((t) => t.trip)).toEqual(['t1', 't3']);
      expect(await a.version('v')).toBe(2);
      expect((await a.readAnalysis('v'))?.updated_ms).toBe(6000);
      await a.commit(commitOf('u', []));
      expect(await a.versions()).toEqual(
        new Map([
          ['u', 1],
          ['v', 2],
        ]),
      );
      expect((await a.readAnalyses()).map((x) => x.vehicle)).toEqual(['u', 'v']);
      expect(await a.version('nobody')).toBeUndefined();
    });

    it('writes nothing of an exclusive block that throws', async () => {
      const a = r.analysis;
      await expect(
        a.exclusive('v', async () => {
          await a.commit(commitOf('v', [tripResult('t1', '2025-07-01T06:00:00Z', 41)]));
          throw new Error('assessment failed');
        }),
      ).rejects.toThrow('assessment failed');
      expect(await a.readAnalysis('v')).toBeUndefined();
      expect(await a.readTripResults('v')).toEqual([]);
    });

    it('loses no update when two connections read-modify-write one vehicle at the same time', async (t) => {
      if (!database.concurrent) t.skip();
      const other = await connect();
      const bump = async (b: ResultsBackend) => {
        for (let i = 0; i < 8; i++)
          await b.analysis.exclusive('v', async () => {
            const n = (await b.analysis.readAnalysis('v'))?.rejected.n ?? 0;
            const c = commitOf('v', []);
            await b.analysis.commit({ ...c, analysis: { ...c.analysis, rejected: { n: n + 1 } } });
          });
      };
      await Promise.all([bump(r), bump(other)]);
      expect((await r.analysis.readAnalysis('v'))?.rejected).toEqual({ n: 16 });
      expect(await r.analysis.version('v')).toBe(16);
    });

    const actor = { by: 'ana', role: 'engineer' as const };

    it('records alert actions, maintenance and tokens, each with its audit row; the revision grows', async () => {
      const w = r.workflow;
      const rev0 = await w.revision();
      await w.recordAlertAction(
        { vehicle: 'v', alert: 'a1', action: 'acknowledge', by: 'ana', at_ms: 10.6, note: 'seen' },
        actor,
      );
      await w.recordAlertAction(
        { vehicle: 'u', alert: 'a2', action: 'close', by: 'ana', at_ms: 20, note: '' },
        actor,
      );
      expect(await w.alertActions('v')).toEqual([
        { vehicle: 'v', alert: 'a1', action: 'acknowledge', by: 'ana', at_ms: 11, note: 'seen' },
      ]);
      expect((await w.allAlertActions()).map((x) => x.alert)).toEqual(['a1', 'a2']);
      const m1 = await w.addMaintenance(
        'v',
        { date: '2025-07-01', action: 'radiator_cleaned', note: 'core' },
        actor,
        30,
      );
      const m2 = await w.addMaintenance('v', { date: '2025-07-02', action: 'fan_repaired' }, actor, 40);
      expect(m2.id).toBeGreaterThan(m1.id);
      expect(await w.maintenance('v')).toEqual([m1, m2]);
      expect(await w.maintenance('u')).toEqual([]);
      await w.addToken({ name: 'ci', role: 'viewer', sha256: 'ab'.repeat(32), created_ms: 50 }, actor);
      expect(await w.tokens()).toEqual([
        { name: 'ci', role: 'viewer', sha256: 'ab'.repeat(32), created_ms: 50 },
      ]);
      expect(await w.removeToken('ci', actor, 60)).toBe(true);
      expect(await w.removeToken('ci', actor, 61)).toBe(false);
      await w.audit(actor, 'fleet.reload', 'fleet', 'changed: none', 70);
      const log = await w.readAudit(10);
      expect(log.map((e) => [e.action, e.target, e.detail])).toEqual([
        ['fleet.reload', 'fleet', 'changed: none'],
        ['token.remove', 'ci', ''],
        ['token.add', 'ci', 'role viewer'],
        ['maintenance.add', 'v', '2025-07-02 fan_repaired'],
        ['maintenance.add', 'v', '2025-07-01 radiator_cleaned: core'],
        ['alert.close', 'u/a2', ''],
        ['alert.acknowledge', 'v/a1', 'seen'],
      ]);
      expect(log[0]).toMatchObject({ by: 'ana', role: 'engineer', at: new Date(70).toISOString() });
      expect(await w.readAudit(2)).toHaveLength(2);
      expect(await w.revision()).toBeGreaterThan(rev0);
    });

    it('a write that fails leaves no audit row and the revision unchanged', async () => {
      const w = r.workflow;
      const t = { name: 'ci', role: 'viewer' as const, sha256: 'cd'.repeat(32), created_ms: 1 };
      await w.addToken(t, actor);
      const rev = await w.revision();
      await expect(w.addToken(t, actor)).rejects.toThrow();
      expect(await w.revision()).toBe(rev);
      expect(await w.readAudit(10)).toHaveLength(1);
    });

    it('shows one connection the writes of another', async () => {
      const other = await connect();
      await other.analysis.commit(commitOf('v', [tripResult('t1', '2025-07-01T06:00:00Z', 41)]));
      await other.workflow.audit(actor, 'x', 'y', 'z', 1);
      expect(await r.analysis.version('v')).toBe(1);
      expect(await r.workflow.revision()).toBe(await other.workflow.revision());
    });
  });
}
