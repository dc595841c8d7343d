import { z } from 'zod';
import { NUMERIC_COLUMNS } from './columns.ts';
import { MAINTENANCE_ACTIONS, maintenanceEntrySchema, vehicleConfigSchema } from './fleet.ts';
import { healthSeriesSchema } from './health-series.ts';
import { idSchema } from './ids.ts';
import {
  ambientOffsetSchema,
  airsideFitSchema,
  CAUSES,
  STATUSES,
  TRENDS,
  tripResultSchema,
  unmeasuredHeatSchema,
} from './results.ts';
import { STORE_FAULTS } from './store-faults.ts';
import { REJECT_REASONS } from './telemetry.ts';

/**
 * The HTTP API's contract (services/api): every request and response body as a zod schema, shared by the
 * server (which validates requests with them and generates its OpenAPI document from them) and the
 * dashboard. Paths are under `/api`; times are ISO 8601 UTC text unless a name ends in `_ms`.
 * Stable: fields are added, never renamed.
 */

export const API_ROLES = ['viewer', 'engineer', 'admin'] as const;
export type ApiRole = (typeof API_ROLES)[number];

const num = z.number().nullable();
const status = z.enum(STATUSES);
const cause = z.enum(CAUSES);
const iso = z.string();

/**
 * A whole number in a query string, in decimal digits only (Number() would read `0x10` as 16, `1e3`
 * as 1000), within [min, max]; `fallback` when absent. The dashboard's client may pass a number: it
 * goes out as its decimal text.
 */
export const queryInt = (min: number, max: number, fallback: number) =>
  z.coerce
    .string<number | string>()
    .regex(/^\d{1,16}$/, 'must be a whole number in decimal digits')
    .transform(Number)
    .pipe(z.number().int().min(min).max(max))
    .default(fallback);

/** Every 4xx/5xx body. `problems` lists each field and the rule it broke (400). */
export const apiErrorSchema = z.object({
  error: z.object({
    /** 'bad_request' | 'unauthorized' | 'forbidden' | 'not_found' | 'too_many_requests' | 'too_large' | 'conflict' | 'internal' */
    code: z.string(),
    message: z.string(),
    problems: z.array(z.object({ where: z.string(), rule: z.string() })).optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

// ---- GET /api/health (no token): liveness, the benchmark's baseline
export const healthResponseSchema = z.object({ ok: z.boolean(), time: iso });
export type HealthResponse = z.infer<typeof healthResponseSchema>;

// ---- GET /api/me (any valid token): who the token is
export const meResponseSchema = z.object({ name: z.string(), role: z.enum(API_ROLES) });
export type MeResponse = z.infer<typeof meResponseSchema>;

// ---- GET /api/status (viewer): ingest and analyzer health
export const ANALYZER_STATES = ['idle', 'working', 'stopped', 'separate'] as const;

export const statusResponseSchema = z.object({
  time: iso,
  /**
   * The sample store: up when it answers and can take writes; else `fault` says why (disk_full,
   * read_only, locked, io_error, unavailable) and `error` in words, naming the file or server.
   */
  store: z.object({
    kind: z.string(),
    up: z.boolean(),
    fault: z.enum(STORE_FAULTS).nullable(),
    error: z.string().nullable(),
  }),
  ingest: z.object({
    vehicles: z.number().int(),
    samples: z.number().int(),
    /** Newest sample of any vehicle. */
    last_sample: iso.nullable(),
    /** s: now − newest sample; null without samples. */
    lag_s: num,
    dead_letters: z.number().int(),
  }),
  analyzer: z.object({
    /**
     * idle: waiting for new samples; working: a pass is going on; stopped: this API's analyzer is not
     * polling; separate: the analyzer runs in a process of its own (figures from the stored results).
     */
    state: z.enum(ANALYZER_STATES),
    running: z.boolean(),
    runs: z.number().int(),
    last_run: iso.nullable(),
    last_error: z.string().nullable(),
    /** Trips and samples analysed by this process since `counting_since` (not the stored totals). */
    trips_analysed: z.number().int(),
    samples_analysed: z.number().int(),
    counting_since: iso.nullable(),
    /** Every trip with a stored result. */
    trips_stored: z.number().int(),
    /** Vehicles with samples newer than their watermark, not counting those on a trip now. */
    backlog_vehicles: z.number().int(),
    /**
     * Vehicles whose last sample came within the trip gap (300 s) of now and is newer than their
     * watermark: a trip going on, analysed once it ends.
     */
    on_trip_vehicles: z.number().int(),
    /**
     * Samples that arrived after their time had been analysed (a logger uploading its buffer late),
     * since the analyzer started; the trips they touch or make were analysed again.
     */
    late_samples: z.number().int(),
    watermarks: z.array(z.object({ vehicle: z.string(), analysed_to: iso.nullable() })),
  }),
});
export type StatusResponse = z.infer<typeof statusResponseSchema>;

// ---- GET /api/fleet (viewer): one row per vehicle of the fleet file
export const vehicleSummarySchema = z.object({
  id: z.string(),
  type: z.string(),
  powertrain: z.string(),
  /** null until the vehicle has been assessed (no trips yet). */
  status: status.nullable(),
  cause: cause.nullable(),
  health: z.object({ ram: num, fan: num }),
  /** %: current margin level at the design point (the health module's level, not one trip's). */
  margin_pct: num,
  /** °C: limiting ambient temperature at the current margin level. */
  limiting_ambient_c: num,
  /** °C: the route's hottest expected ambient the limiting ambient is judged against; null when not set. */
  route_max_ambient_c: num,
  margin_basis: z.enum(['ram', 'fan']).nullable(),
  /** When inspection is due: the projected date, or when the status entered inspect. */
  projected_inspect_date: iso.nullable(),
  /** Whole days projected_inspect_date lies before the answer's time: overdue; null when ahead or none. */
  projected_inspect_overdue_days: z.number().int().nullable().optional(),
  /** Newest sample received. */
  last_seen: iso.nullable(),
  last_trip_end: iso.nullable(),
  /** Direction of the margin since the governing band's last change (Theil–Sen, 95 %); null when too few trips. */
  trend: z.enum(TRENDS).nullable(),
  /** Points of margin per 30 days behind `trend`: the rate the finding and the alerts quote. */
  trend_pct_per_30d: num.optional(),
  trips: z.number().int(),
  /** Alerts at watch or inspect not yet closed. */
  open_alerts: z.number().int(),
});
export type VehicleSummary = z.infer<typeof vehicleSummarySchema>;

export const fleetResponseSchema = z.object({
  time: iso,
  counts: z.object({
    ok: z.number().int(),
    watch: z.number().int(),
    inspect: z.number().int(),
    unassessed: z.number().int(),
  }),
  vehicles: z.array(vehicleSummarySchema),
  safety_caution: z.string(),
});
export type FleetResponse = z.infer<typeof fleetResponseSchema>;

// ---- GET /api/vehicles/{id} (viewer)
export const ALERT_STATES = ['open', 'acknowledged', 'closed'] as const;
export type AlertState = (typeof ALERT_STATES)[number];

const actionStamp = z.object({ by: z.string(), at: iso, note: z.string() });
/** Who closed an alert that closed by itself (superseded, or a return to ok). */
export const ALERT_SELF_CLOSER = 'thermargin';

export const alertViewSchema = z.object({
  /** Stable across re-analysis: the alert's time (compact) and status, e.g. `20260701T081500Z-watch`. */
  id: z.string(),
  vehicle: z.string(),
  time: iso,
  status,
  cause,
  detail: z.string(),
  state: z.enum(ALERT_STATES),
  acknowledged: actionStamp.nullable(),
  /**
   * Who closed it, when and why; by ALERT_SELF_CLOSER when it closed by itself: a return to ok needs no
   * acknowledgement, and an alert a later one of the same vehicle replaced is superseded.
   */
  closed: actionStamp.nullable(),
});
export type AlertView = z.infer<typeof alertViewSchema>;

export const maintenanceViewSchema = z.object({
  /** `fleet-<n>` for fleet-file entries, `api-<n>` for entries added through the API. */
  id: z.string(),
  source: z.enum(['fleet', 'api']),
  date: z.string(),
  action: z.enum(MAINTENANCE_ACTIONS),
  note: z.string().nullable(),
  by: z.string().nullable(),
  /** When it was added through the API; null for fleet-file entries. */
  recorded_at: iso.nullable(),
});
export type MaintenanceView = z.infer<typeof maintenanceViewSchema>;

/** Trips shown on the vehicle page, newest first; the rest through the trips route. */
export const VEHICLE_RECENT_TRIPS = 20;

export const vehicleResponseSchema = z.object({
  id: z.string(),
  /** The vehicle's entry in the fleet file. */
  config: vehicleConfigSchema,
  summary: vehicleSummarySchema,
  cause_evidence: z.string().nullable(),
  notes: z.array(z.string()),
  candidates: z.array(z.object({ cause, score: z.number(), evidence: z.string() })),
  series: healthSeriesSchema.nullable(),
  alerts: z.array(alertViewSchema),
  maintenance: z.array(maintenanceViewSchema),
  /** The newest VEHICLE_RECENT_TRIPS trips, newest first. */
  trips: z.array(tripResultSchema),
  trips_total: z.number().int(),
  safety_caution: z.string(),
  /** What the vehicle stage learned (core/vehicle/learn.ts); absent before its first analysis. */
  airside_fit: airsideFitSchema.optional(),
  unmeasured_heat: unmeasuredHeatSchema.optional(),
  ambient_offset: z.array(ambientOffsetSchema).optional(),
});
export type VehicleResponse = z.infer<typeof vehicleResponseSchema>;

// ---- GET /api/vehicles/{id}/trips (viewer): paged, newest first
const dateParam = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}(T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?Z)?$/, 'must be YYYY-MM-DD or ISO 8601 UTC')
  .refine((s) => {
    const ms = Date.parse(s.length === 10 ? `${s}T00:00:00Z` : s);
    return Number.isFinite(ms) && new Date(ms).toISOString().slice(0, 10) === s.slice(0, 10);
  }, 'must be a real date');

export const tripsQuerySchema = z.strictObject({
  /** Trips starting at or after this time. */
  from: dateParam.optional(),
  /** Trips starting before this time. */
  to: dateParam.optional(),
  status: status.optional(),
  limit: queryInt(1, 500, 50),
  offset: queryInt(0, 1_000_000, 0),
});
export type TripsQuery = z.infer<typeof tripsQuerySchema>;

export const tripsResponseSchema = z.object({
  vehicle: z.string(),
  total: z.number().int(),
  offset: z.number().int(),
  limit: z.number().int(),
  trips: z.array(tripResultSchema),
});
export type TripsResponse = z.infer<typeof tripsResponseSchema>;

// ---- GET /api/vehicles/{id}/trips/{trip}?points=N (viewer): signals downsampled for charts
export const TRACE_COLUMNS = [
  /** The sample's own signals. */
  ...NUMERIC_COLUMNS,
  /** kW: heat generated into the coolant (drivetrain/heat.ts). */
  'heat_generated_kw',
  /** kW: heat rejected by the radiator, Q = k·A·ITD at the sample's air flow; null outside valid windows. */
  'heat_rejected_kw',
  /** W/(m²·K): the k of the valid window the sample belongs to (band reference condition); else null. */
  'k_w_m2k',
  /** 1 when the sample counted for the ram band's k, else 0. */
  'counted_ram',
  'counted_fan',
] as const;
export type TraceColumn = (typeof TRACE_COLUMNS)[number];

export const traceQuerySchema = z.strictObject({
  points: queryInt(10, 20_000, 2000),
});

export const traceResponseSchema = z.object({
  vehicle: z.string(),
  trip: tripResultSchema,
  /** °C: the vehicle's coolant limit, drawn on the temperature chart. */
  coolant_limit_c: z.number(),
  /** Samples read for the trip, and points returned (gaps add one null row each). */
  samples: z.number().int(),
  points: z.number().int(),
  method: z.literal('lttb'),
  columns: z.array(z.enum(TRACE_COLUMNS)),
  /** Columnar: data[j] is the column `columns[j]`; null for a gap or a missing value. */
  data: z.array(z.array(num)),
});
export type TraceResponse = z.infer<typeof traceResponseSchema>;

// ---- GET /api/rejected (viewer): refused data per vehicle and reason
export const rejectedResponseSchema = z.object({
  vehicles: z.array(
    z.object({
      /** '' for messages whose vehicle could not be read. */
      vehicle: z.string(),
      /** Refused by the ingester (dead letters), by reason. */
      ingest: z.record(z.string(), z.number().int()),
      /** Rejected by the core's cleaning during analysis, by reason. */
      cleaning: z.record(z.string(), z.number().int()),
      total: z.number().int(),
    }),
  ),
  total: z.number().int(),
});
export type RejectedResponse = z.infer<typeof rejectedResponseSchema>;

// ---- GET /api/rejected/messages?vehicle=&reason=&limit= (viewer): the refused messages themselves
export const deadLettersQuerySchema = z.strictObject({
  /** '' for messages whose vehicle could not be read; else an id (checked here, before any store is asked). */
  vehicle: z.union([z.literal(''), idSchema]).optional(),
  reason: z.enum(REJECT_REASONS).optional(),
  limit: queryInt(1, 500, 50),
});
export type DeadLettersQuery = z.infer<typeof deadLettersQuerySchema>;

export const deadLettersResponseSchema = z.object({
  /** Newest first. */
  letters: z.array(
    z.object({
      received: iso,
      vehicle: z.string(),
      reason: z.enum(REJECT_REASONS),
      /** The rule the message broke, in words, with where (`samples[3].speed_kmh ...`). */
      detail: z.string(),
      topic: z.string(),
      /** The payload or the offending sample, cut to 2 KiB. */
      excerpt: z.string(),
      payload_bytes: z.number().int(),
    }),
  ),
});
export type DeadLettersResponse = z.infer<typeof deadLettersResponseSchema>;

// ---- Writes (each recorded in the audit log with who and when)
export const alertActionBodySchema = z.strictObject({ note: z.string().trim().min(1).max(2000) });
export type AlertActionBody = z.infer<typeof alertActionBodySchema>;
/** POST /api/vehicles/{id}/alerts/{alert}/acknowledge and …/close (engineer) → AlertView. */
export const alertActionResponseSchema = alertViewSchema;

/** POST /api/vehicles/{id}/maintenance (engineer): re-baselines as the health module specifies. */
export const maintenanceBodySchema = maintenanceEntrySchema.omit({ by: true });
export type MaintenanceBody = z.infer<typeof maintenanceBodySchema>;
export const maintenanceResponseSchema = z.object({
  entry: maintenanceViewSchema,
  summary: vehicleSummarySchema,
});
export type MaintenanceResponse = z.infer<typeof maintenanceResponseSchema>;

/** POST /api/fleet/reload (admin): re-reads the fleet file; PUT /api/fleet (admin): replaces it. */
export const fleetReloadResponseSchema = z.object({
  vehicles: z.number().int(),
  /** Vehicles added, removed or whose entry changed: their results are recomputed. */
  changed: z.array(z.string()),
});
export type FleetReloadResponse = z.infer<typeof fleetReloadResponseSchema>;
/** PUT /api/fleet's body: the fleet file as JSON, validated like the file (its own errors, per field). */
export const fleetReplaceBodySchema = z.unknown();

// ---- Tokens (admin)
export const tokenViewSchema = z.object({ name: z.string(), role: z.enum(API_ROLES), source: z.string() });
export const tokensResponseSchema = z.object({ tokens: z.array(tokenViewSchema) });
export const tokenCreateBodySchema = z.strictObject({ name: idSchema, role: z.enum(API_ROLES) });
/** The secret is shown once; only its hash is kept. */
export const tokenCreateResponseSchema = z.object({
  name: z.string(),
  role: z.enum(API_ROLES),
  token: z.string(),
});
export const tokenRevokeResponseSchema = z.object({ removed: z.string() });

// ---- GET /api/audit (admin): newest first
export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: iso,
  by: z.string(),
  role: z.enum(API_ROLES),
  action: z.string(),
  target: z.string(),
  detail: z.string(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;
export const auditQuerySchema = z.strictObject({
  limit: queryInt(1, 1000, 100),
});
export const auditResponseSchema = z.object({ entries: z.array(auditEntrySchema) });

// ---- GET /api/events (viewer): server-sent events; `event:` names and their `data:` JSON
export const eventSchemas = {
  /** A trip was analysed (or re-analysed). */
  trip: z.object({ vehicle: z.string(), trip: tripResultSchema }),
  /** A vehicle's status changed. */
  status: z.object({ vehicle: z.string(), from: status.nullable(), to: status, time: iso }),
  /** The newest sample per vehicle, as received (sent at most once per poll interval). */
  sample: z.object({
    vehicle: z.string(),
    time: iso,
    speed_kmh: z.number(),
    power_kw: z.number(),
    coolant_in_c: z.number(),
    ambient_c: z.number(),
    fan_pct: z.number(),
  }),
} as const;
export type ApiEventName = keyof typeof eventSchemas;
export type ApiEvent = {
  [K in ApiEventName]: { event: K; data: z.infer<(typeof eventSchemas)[K]> };
}[ApiEventName];
