import type {
  AlertView,
  ApiError,
  DeadLettersQuery,
  DeadLettersResponse,
  FleetResponse,
  MaintenanceBody,
  MaintenanceResponse,
  MeResponse,
  RejectedResponse,
  StatusResponse,
  TraceResponse,
  TripsResponse,
  VehicleResponse,
} from '@thermargin/shared/api';
import type { CalculatorBody, CalculatorResponse, SizingResponse } from '@thermargin/shared/sizing-api';

/** A refused or failed request, with the API's own words. */
export class ApiFailure extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    /** Each field and the rule it broke (a 400). */
    readonly problems: { where: string; rule: string }[] = [],
  ) {
    super(message);
  }
}

const enc = encodeURIComponent;

/** The API over fetch with a bearer token; every route the dashboard uses, typed by the shared contract. */
export class ApiClient {
  constructor(private readonly token: string) {}

  async request<T>(method: string, path: string, body?: unknown): Promise<T> {
    let res: Response;
    try {
      res = await fetch(path, {
        method,
        headers: {
          authorization: `Bearer ${this.token}`,
          ...(body === undefined ? {} : { 'content-type': 'application/json' }),
        },
        ...(body === undefined ? {} : { body: JSON.stringify(body) }),
      });
    } catch (e) {
      throw new ApiFailure(0, 'network', `the API cannot be reached (${(e as Error).message})`);
    }
    const text = await res.text();
    let json: unknown;
    try {
      json = text ? JSON.parse(text) : null;
    } catch {
      throw new ApiFailure(res.status, 'bad_response', `${method} ${path}: the answer is not JSON`);
    }
    if (!res.ok) {
      const err = (json as ApiError | null)?.error;
      throw new ApiFailure(
        res.status,
        err?.code ?? 'http',
        err?.message ?? `${method} ${path}: ${res.status}`,
        err?.problems,
      );
    }
    return json as T;
  }

  me = () => this.request<MeResponse>('GET', '/api/me');
  fleet = () => this.request<FleetResponse>('GET', '/api/fleet');
  status = () => this.request<StatusResponse>('GET', '/api/status');
  rejected = () => this.request<RejectedResponse>('GET', '/api/rejected');
  /** The newest refused messages, of one vehicle ('' when unreadable) and reason when given. */
  letters = (f: Pick<DeadLettersQuery, 'vehicle' | 'reason'>, limit: number) => {
    const q = new URLSearchParams({ limit: String(limit) });
    if (f.vehicle !== undefined) q.set('vehicle', f.vehicle);
    if (f.reason !== undefined) q.set('reason', f.reason);
    return this.request<DeadLettersResponse>('GET', `/api/rejected/letters?${q}`);
  };
  vehicle = (id: string) => this.request<VehicleResponse>('GET', `/api/vehicles/${enc(id)}`);
  trips = (id: string, offset: number, limit: number) =>
    this.request<TripsResponse>('GET', `/api/vehicles/${enc(id)}/trips?offset=${offset}&limit=${limit}`);
  trace = (id: string, trip: string, points: number) =>
    this.request<TraceResponse>('GET', `/api/vehicles/${enc(id)}/trips/${enc(trip)}?points=${points}`);
  alertAction = (id: string, alert: string, action: 'acknowledge' | 'close', note: string) =>
    this.request<AlertView>('POST', `/api/vehicles/${enc(id)}/alerts/${enc(alert)}/${action}`, { note });
  logMaintenance = (id: string, body: MaintenanceBody) =>
    this.request<MaintenanceResponse>('POST', `/api/vehicles/${enc(id)}/maintenance`, body);
  sizing = () => this.request<SizingResponse>('GET', '/api/sizing');
  calculate = (body: CalculatorBody) =>
    this.request<CalculatorResponse>('POST', '/api/sizing/calculator', body);
}
