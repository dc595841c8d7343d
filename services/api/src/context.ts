import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import { type ApiDeps, API_DEFAULTS } from './deps.ts';
import { notFound } from './http-error.ts';
import { ResultReader } from './reader.ts';
import { alertViews, isOpenAlert, type VehicleData, vehicleSummary } from './views.ts';

/** What every route handler works with. */
export class ApiContext {
  readonly reader: ResultReader;
  readonly clock: () => number;

  constructor(readonly deps: ApiDeps) {
    this.clock = deps.clock ?? Date.now;
    this.reader = new ResultReader(deps.results, deps.samples, this.clock, API_DEFAULTS.sample_cache_ms);
  }

  /** The vehicle's model from the fleet file, or 404. */
  model(id: string): VehicleModel {
    const m = this.deps.fleet.current().models.get(id);
    if (!m) throw notFound(`vehicle ${id}`);
    return m;
  }

  /** The vehicle's stored results, or 404 when it has none yet. */
  async data(id: string): Promise<VehicleData> {
    this.model(id);
    const d = await this.reader.vehicle(id);
    if (!d) throw notFound(`results of vehicle ${id}`);
    return d;
  }

  async summary(id: string) {
    const model = this.model(id);
    const data = await this.reader.vehicle(id);
    const latest = (await this.reader.latest()).get(id);
    const open = alertViews(id, data?.result, await this.deps.workflow.alertActions(id)).filter(
      isOpenAlert,
    ).length;
    return vehicleSummary(model, data, latest?.time_ms, open, this.clock());
  }
}
