import {
  type DeadLettersResponse,
  type FleetResponse,
  type RejectedResponse,
  safetyCaution,
  type StatusResponse,
  type TripsQuery,
  type TripsResponse,
  VEHICLE_RECENT_TRIPS,
  type StoreFaultKind,
  type VehicleResponse,
} from '@thermargin/shared';
import { storeFault } from '@thermargin/store';
import type { AlertAction } from '@thermargin/store/workflow';
import type { Context } from 'hono';
import { utcDay } from '@thermargin/core/health/due';
import { tripGoingOn } from '@thermargin/core/trip/split';
import type { ApiContext } from './context.ts';
import { JsonPage } from './json-page.ts';
import type { Answer, Handlers } from './route.ts';
import { alertViews, isOpenAlert, maintenanceViews, vehicleSummary } from './views.ts';

const iso = (ms: number) => new Date(ms).toISOString();
const dayStart = (s: string) => Date.parse(s.length === 10 ? `${s}T00:00:00Z` : s);

type ReadRoute = 'health' | 'status' | 'fleet' | 'vehicle' | 'trips' | 'rejected' | 'deadLetters';

/** The read routes: liveness, status, the fleet and its vehicles, their trips, and the refused data. */
export function readRoutes(x: ApiContext): Handlers<ReadRoute> {
  const fleet = fleetPages(x);
  const vehicle = vehiclePages(x);
  return {
    health: async () => ({ ok: true, time: iso(x.clock()) }),
    status: () => status(x),
    fleet: async ({ c }) => fleet(c),
    vehicle: async ({ c, params }) => vehicle(c, params.id),
    trips: ({ params, query }) => trips(x, params.id, query),
    rejected: () => rejected(x),
    deadLetters: async ({ query }): Promise<DeadLettersResponse> => {
      const letters = await x.deps.samples.readDeadLetters(query);
      return { letters: letters.map(({ received_ms, ...l }) => ({ received: iso(received_ms), ...l })) };
    },
  };
}

/** Ingest and analyzer health: the store's answer, the newest sample, every watermark. */
async function status(x: ApiContext): Promise<StatusResponse> {
  const { deps } = x;
  let up = true;
  let error: string | null = null;
  let fault: StoreFaultKind | null = null;
  try {
    await deps.samples.ping();
  } catch (e) {
    up = false;
    const f = storeFault(e);
    [error, fault] = [f.reason, f.kind];
  }
  const spans = up ? await x.reader.spans() : [];
  const analyses = await deps.results.readAnalyses();
  const wm = new Map(analyses.map((a) => [a.vehicle, a.analysed_to_ms]));
  const last = spans.reduce((m, s) => Math.max(m, s.last_ms), Number.NEGATIVE_INFINITY);
  const letters = up ? (await deps.samples.countDeadLetters()).reduce((n, l) => n + l.count, 0) : 0;
  const s = deps.analyzer?.stats;
  const now = x.clock(); // one reading for the whole answer
  const behind = spans.filter((sp) => (wm.get(sp.vehicle) ?? 0) <= sp.last_ms);
  const onTrip = behind.filter((sp) => tripGoingOn(sp.last_ms, now)).length;
  const lastRun = analyses.reduce((m, a) => Math.max(m, a.updated_ms), Number.NEGATIVE_INFINITY);
  return {
    time: iso(now),
    store: { kind: deps.samples.kind, up, fault, error },
    ingest: {
      vehicles: spans.length,
      samples: spans.reduce((n, sp) => n + sp.count, 0),
      last_sample: Number.isFinite(last) ? iso(last) : null,
      lag_s: Number.isFinite(last) ? (now - last) / 1000 : null,
      dead_letters: letters,
    },
    analyzer: {
      state: !s ? 'separate' : s.running ? 'working' : s.polling ? 'idle' : 'stopped',
      running: s?.running ?? false,
      runs: s?.runs ?? 0,
      last_run: s?.last_run_ms != null ? iso(s.last_run_ms) : Number.isFinite(lastRun) ? iso(lastRun) : null,
      last_error: s?.last_error ?? null,
      trips_analysed: s?.trips_analysed ?? 0,
      samples_analysed: s?.samples_analysed ?? 0,
      counting_since: s ? iso(s.counting_since_ms) : null,
      trips_stored: [...(await x.reader.all()).values()].reduce((n, d) => n + d.result.trips.length, 0),
      backlog_vehicles: behind.length - onTrip,
      on_trip_vehicles: onTrip,
      late_samples: s?.late_samples ?? 0,
      watermarks: spans.map((sp) => {
        const w = wm.get(sp.vehicle);
        return { vehicle: sp.vehicle, analysed_to: w === undefined ? null : iso(w) };
      }),
    },
  };
}

/**
 * The fleet summary, kept encoded: the same results, writes, newest samples, fleet file and day give
 * the same answer (its time aside), so a repeat is a buffer write.
 */
function fleetPages(x: ApiContext): (c: Context) => Promise<Answer<FleetResponse>> {
  const { deps } = x;
  let kept:
    | { key: string; latest: unknown; fleet: unknown; revision: number; page: JsonPage<FleetResponse> }
    | undefined;
  return async (c) => {
    const all = await x.reader.all();
    const latest = await x.reader.latest();
    const revision = await deps.workflow.revision();
    const fleetNow = deps.fleet.current().input;
    // The day counts too: an inspection date passes into overdue by it.
    const now = x.clock();
    const key = `${[...all.values()].map((d) => d.version).join(',')}@${utcDay(now)}`;
    if (
      kept &&
      kept.key === key &&
      kept.latest === latest &&
      kept.fleet === fleetNow &&
      kept.revision === revision
    )
      return kept.page.respond(c);
    const actions = new Map<string, AlertAction[]>();
    for (const a of await deps.workflow.allAlertActions())
      actions.set(a.vehicle, [...(actions.get(a.vehicle) ?? []), a]);
    const counts = { ok: 0, watch: 0, inspect: 0, unassessed: 0 };
    const vehicles = [...deps.fleet.current().models.values()].map((m) => {
      const d = all.get(m.id);
      const open = alertViews(m.id, d?.result, actions.get(m.id) ?? []).filter(isOpenAlert).length;
      const s = vehicleSummary(m, d, latest.get(m.id)?.time_ms, open, now);
      counts[s.status ?? 'unassessed']++;
      return s;
    });
    const page = JsonPage.of<FleetResponse>({
      time: iso(x.clock()),
      counts,
      vehicles,
      safety_caution: safetyCaution(fleetNow.vehicles.map((v) => v.powertrain)),
    });
    kept = { key, latest, fleet: fleetNow, revision, page };
    return page.respond(c);
  };
}

/**
 * One vehicle's page, kept encoded per vehicle: it changes only with the results, a write (any write
 * bumps the revision), a new sample, a fleet reload or the day (an inspection date turns overdue).
 */
function vehiclePages(x: ApiContext): (c: Context, id: string) => Promise<Answer<VehicleResponse>> {
  const { deps } = x;
  const pages = new Map<string, { key: string; page: JsonPage<VehicleResponse> }>();
  let fleetAt = deps.fleet.current().input;
  let fleetGen = 0;
  return async (c, id) => {
    const model = x.model(id);
    const data = await x.reader.vehicle(id);
    const latest = (await x.reader.latest()).get(id);
    if (deps.fleet.current().input !== fleetAt) {
      fleetAt = deps.fleet.current().input;
      fleetGen++;
    }
    const now = x.clock();
    const key = `${data?.version}:${await deps.workflow.revision()}:${latest?.time_ms}:${fleetGen}@${utcDay(now)}`;
    const hit = pages.get(id);
    if (hit?.key === key) return hit.page.respond(c);
    const config = fleetAt.vehicles.find((v) => v.id === id)!;
    const alerts = alertViews(id, data?.result, await deps.workflow.alertActions(id));
    const page = JsonPage.of<VehicleResponse>({
      id,
      config,
      summary: vehicleSummary(model, data, latest?.time_ms, alerts.filter(isOpenAlert).length, now),
      cause_evidence: data?.result.cause_evidence ?? null,
      notes: data?.assessment.notes ?? [],
      candidates: data?.assessment.candidates ?? [],
      series: data?.assessment.series ?? null,
      alerts,
      maintenance: maintenanceViews(model, await deps.workflow.maintenance(id)),
      trips: data?.newest_first.slice(0, VEHICLE_RECENT_TRIPS) ?? [],
      trips_total: data?.result.trips.length ?? 0,
      safety_caution: safetyCaution([config.powertrain]),
      ...(data?.result.airside_fit ? { airside_fit: data.result.airside_fit } : {}),
      ...(data?.result.unmeasured_heat ? { unmeasured_heat: data.result.unmeasured_heat } : {}),
      ...(data?.result.ambient_offset ? { ambient_offset: data.result.ambient_offset } : {}),
    });
    pages.set(id, { key, page });
    return page.respond(c);
  };
}

/** A vehicle's trips, newest first, filtered by start date and status, paged. */
async function trips(x: ApiContext, id: string, query: TripsQuery): Promise<TripsResponse> {
  x.model(id);
  const data = await x.reader.vehicle(id);
  const from = query.from === undefined ? Number.NEGATIVE_INFINITY : dayStart(query.from);
  const to = query.to === undefined ? Number.POSITIVE_INFINITY : dayStart(query.to);
  const hits = (data?.newest_first ?? []).filter((t) => {
    const s = Date.parse(t.start);
    return s >= from && s < to && (query.status === undefined || t.status === query.status);
  });
  return {
    vehicle: id,
    total: hits.length,
    offset: query.offset,
    limit: query.limit,
    trips: hits.slice(query.offset, query.offset + query.limit),
  };
}

/** Refused data per vehicle: the ingester's dead letters and the analysis's cleaning rejections. */
async function rejected(x: ApiContext): Promise<RejectedResponse> {
  const rows = new Map<string, RejectedResponse['vehicles'][number]>();
  const row = (v: string) => {
    let r = rows.get(v);
    if (!r) rows.set(v, (r = { vehicle: v, ingest: {}, cleaning: {}, total: 0 }));
    return r;
  };
  for (const l of await x.deps.samples.countDeadLetters()) {
    const r = row(l.vehicle);
    r.ingest[l.reason] = (r.ingest[l.reason] ?? 0) + l.count;
    r.total += l.count;
  }
  for (const a of await x.deps.results.readAnalyses()) {
    for (const [reason, n] of Object.entries(a.rejected)) {
      const r = row(a.vehicle);
      r.cleaning[reason] = n;
      r.total += n;
    }
  }
  const vehicles = [...rows.values()].sort((a, b) => a.vehicle.localeCompare(b.vehicle));
  return { vehicles, total: vehicles.reduce((n, r) => n + r.total, 0) };
}
