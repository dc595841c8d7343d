import type { z } from 'zod';
import {
  type ApiRole,
  alertActionBodySchema,
  alertActionResponseSchema,
  auditQuerySchema,
  auditResponseSchema,
  deadLettersQuerySchema,
  deadLettersResponseSchema,
  fleetReloadResponseSchema,
  fleetReplaceBodySchema,
  fleetResponseSchema,
  healthResponseSchema,
  maintenanceBodySchema,
  maintenanceResponseSchema,
  meResponseSchema,
  rejectedResponseSchema,
  statusResponseSchema,
  tokenCreateBodySchema,
  tokenCreateResponseSchema,
  tokenRevokeResponseSchema,
  tokensResponseSchema,
  traceQuerySchema,
  traceResponseSchema,
  tripsQuerySchema,
  tripsResponseSchema,
  vehicleResponseSchema,
} from './api.ts';
import { framesResponseSchema } from './intake-api.ts';
import { calculatorBodySchema, calculatorResponseSchema, sizingResponseSchema } from './sizing-api.ts';

/** One route: what the server registers and documents (OpenAPI) and what the dashboard's client calls. */
export interface RouteSpec {
  method: 'get' | 'post' | 'put' | 'delete';
  /** Hono form, e.g. `/api/vehicles/:id`; every `:param` is validated as an id. */
  path: string;
  /** Old paths still answered the same way for one release after a rename, documented as deprecated. */
  old_paths?: readonly string[];
  /** The least role that may call it; null: no token needed. */
  role: ApiRole | null;
  summary: string;
  query?: z.ZodType;
  body?: z.ZodType;
  /** The answer's schema; null for a stream (server-sent events). */
  response: z.ZodType | null;
  /** bytes: the largest body, when not the API's default. */
  max_body_bytes?: number;
}

/**
 * Every route of the API by name, in the order the server registers them. The server implements each
 * name with a handler typed from its entry, the OpenAPI document is generated from it, and the
 * dashboard's client builds its requests from it: a path, method, role or schema is written here only.
 */
export const API_ROUTES = {
  health: {
    method: 'get',
    path: '/api/health',
    role: null,
    summary: 'Liveness (no token)',
    response: healthResponseSchema,
  },
  status: {
    method: 'get',
    path: '/api/status',
    role: 'viewer',
    summary: 'Ingest and analyzer health',
    response: statusResponseSchema,
  },
  fleet: {
    method: 'get',
    path: '/api/fleet',
    role: 'viewer',
    summary: 'Every vehicle: status, cause, health per band, margin, limiting ambient, projected date, trend',
    response: fleetResponseSchema,
  },
  vehicle: {
    method: 'get',
    path: '/api/vehicles/:id',
    role: 'viewer',
    summary: 'One vehicle: config, health and margin series, alerts, maintenance log, latest trips',
    response: vehicleResponseSchema,
  },
  trips: {
    method: 'get',
    path: '/api/vehicles/:id/trips',
    role: 'viewer',
    summary: 'Trips, newest first, filtered by start date and status, paged',
    query: tripsQuerySchema,
    response: tripsResponseSchema,
  },
  rejected: {
    method: 'get',
    path: '/api/rejected',
    role: 'viewer',
    summary: 'Refused data per vehicle and reason: ingest dead letters and cleaning rejections',
    response: rejectedResponseSchema,
  },
  deadLetters: {
    method: 'get',
    path: '/api/rejected/messages',
    old_paths: ['/api/rejected/letters'],
    role: 'viewer',
    summary: 'The refused messages, newest first: rule broken, topic and payload excerpt',
    query: deadLettersQuerySchema,
    response: deadLettersResponseSchema,
  },
  intakeFrames: {
    method: 'get',
    path: '/api/intake/frames',
    role: 'viewer',
    summary:
      'Per vehicle sending CAN frames: frames decoded, of unknown PGNs, values not available, samples built',
    response: framesResponseSchema,
  },
  trace: {
    method: 'get',
    path: '/api/vehicles/:id/trips/:trip',
    role: 'viewer',
    summary:
      'One trip with its signals, heat, per-sample k and band membership, downsampled (LTTB) for charts',
    query: traceQuerySchema,
    response: traceResponseSchema,
  },
  acknowledgeAlert: {
    method: 'post',
    path: '/api/vehicles/:id/alerts/:alert/acknowledge',
    role: 'engineer',
    summary: 'Acknowledge an alert with a note',
    body: alertActionBodySchema,
    response: alertActionResponseSchema,
  },
  closeAlert: {
    method: 'post',
    path: '/api/vehicles/:id/alerts/:alert/close',
    role: 'engineer',
    summary: 'Close an alert with a note',
    body: alertActionBodySchema,
    response: alertActionResponseSchema,
  },
  logMaintenance: {
    method: 'post',
    path: '/api/vehicles/:id/maintenance',
    role: 'engineer',
    summary: 'Log maintenance; re-baselines the bands the action affects and re-assesses the vehicle',
    body: maintenanceBodySchema,
    response: maintenanceResponseSchema,
  },
  reloadFleet: {
    method: 'post',
    path: '/api/fleet/reload',
    role: 'admin',
    summary: 'Re-read the fleet file; changed vehicles are re-analysed',
    response: fleetReloadResponseSchema,
  },
  replaceFleet: {
    method: 'put',
    path: '/api/fleet',
    role: 'admin',
    summary: 'Replace the fleet file (JSON body, validated like the file); changed vehicles are re-analysed',
    body: fleetReplaceBodySchema,
    max_body_bytes: 1024 * 1024,
    response: fleetReloadResponseSchema,
  },
  tokens: {
    method: 'get',
    path: '/api/tokens',
    role: 'admin',
    summary: 'Token names and roles (never secrets or hashes)',
    response: tokensResponseSchema,
  },
  createToken: {
    method: 'post',
    path: '/api/tokens',
    role: 'admin',
    summary: 'Create a token; its secret is in this answer only',
    body: tokenCreateBodySchema,
    response: tokenCreateResponseSchema,
  },
  revokeToken: {
    method: 'delete',
    path: '/api/tokens/:name',
    role: 'admin',
    summary: 'Revoke a token added through the API (configured ones are removed from their file or env)',
    response: tokenRevokeResponseSchema,
  },
  audit: {
    method: 'get',
    path: '/api/audit',
    role: 'admin',
    summary: 'The audit log of every write, newest first',
    query: auditQuerySchema,
    response: auditResponseSchema,
  },
  events: {
    method: 'get',
    path: '/api/events',
    role: 'viewer',
    summary:
      'Server-sent events: trip (new trip result), status (status change), sample (newest sample per vehicle); ' +
      'revoked (the token was revoked: the stream ends). With PostgreSQL results each trip and status event has an id; ' +
      'a client reconnecting with Last-Event-ID (to any API replica) first gets the trips and status changes it missed',
    response: null,
  },
  sizing: {
    method: 'get',
    path: '/api/sizing',
    role: 'viewer',
    summary:
      'Fleet sizing figures from the stores, as `thermargin sizing` writes them: field vs bench k, duty cycle, fouling, derates, what if',
    response: sizingResponseSchema,
  },
  calculator: {
    method: 'post',
    path: '/api/sizing/calculator',
    role: 'viewer',
    summary:
      'Sizing calculator: required area and what an area supports from the field k, drivetrain comparison, what-if replay',
    body: calculatorBodySchema,
    response: calculatorResponseSchema,
  },
  me: {
    method: 'get',
    path: '/api/me',
    role: 'viewer',
    summary: "The token's name and role (any valid token)",
    response: meResponseSchema,
  },
} as const satisfies Record<string, RouteSpec>;

export type ApiRoutes = typeof API_ROUTES;
export type RouteName = keyof ApiRoutes;

/** `'/a/:id/b/:trip'` → `'id' | 'trip'`. */
type ParamNames<P extends string> = P extends `${string}:${infer N}/${infer Rest}`
  ? N | ParamNames<`/${Rest}`>
  : P extends `${string}:${infer N}`
    ? N
    : never;

type Field<K extends RouteName, F extends string> = ApiRoutes[K] extends {
  [f in F]: infer S extends z.ZodType;
}
  ? S
  : undefined;
type Out<S> = S extends z.ZodType ? z.output<S> : undefined;
type In<S> = S extends z.ZodType ? z.input<S> : undefined;

/** A route's path parameters by name. */
export type RouteParams<K extends RouteName> = Record<ParamNames<ApiRoutes[K]['path']>, string>;
/** Its query and body as the server has them after validation (defaults filled in). */
export type RouteQuery<K extends RouteName> = Out<Field<K, 'query'>>;
export type RouteBody<K extends RouteName> = Out<Field<K, 'body'>>;
/** Its answer; `never` for a stream. */
export type RouteResponse<K extends RouteName> = ApiRoutes[K]['response'] extends z.ZodType
  ? z.output<ApiRoutes[K]['response']>
  : never;

/** What a caller gives: parameters, query and body as sent (optional fields and defaults left out). */
export type RouteRequest<K extends RouteName> = ([ParamNames<ApiRoutes[K]['path']>] extends [never]
  ? unknown
  : { params: RouteParams<K> }) &
  (Field<K, 'query'> extends undefined ? unknown : { query: In<Field<K, 'query'>> }) &
  (Field<K, 'body'> extends undefined ? unknown : { body: In<Field<K, 'body'>> });
