import { TRACE_COLUMNS, type TraceResponse } from '@thermargin/shared';
import { cleanSamples } from '@thermargin/core/trip/clean';
import { ESTIMATOR_DEFAULTS } from '@thermargin/core/trip/estimator-options';
import { tripSampleView } from '@thermargin/core/trip/sample-view';
import { storedReferral } from '@thermargin/core/vehicle/learn';
import type { ApiContext } from './context.ts';
import { notFound } from './http-error.ts';
import type { Handlers } from './route.ts';
import { traceColumns } from './trace.ts';

export function traceRoutes(x: ApiContext): Handlers<'trace'> {
  return {
    trace: async ({ params, query }): Promise<TraceResponse> => {
      const id = params.id;
      const model = x.model(id);
      const data = await x.reader.vehicle(id);
      const trip = data?.newest_first.find((t) => t.trip === params.trip);
      if (!data || !trip) throw notFound(`trip ${params.trip} of vehicle ${id}`);
      const raw = await x.deps.samples.readSamples(id, Date.parse(trip.start), Date.parse(trip.end) + 1);
      // The same cleaning the analysis ran, so the samples shown are the samples used.
      const { columns: c } = cleanSamples(raw);
      // k and heat rejected per sample with the air side and corrections the vehicle stage learned.
      const referral = storedReferral(model, data.result, trip);
      const view = tripSampleView(c, 0, c.n, model, ESTIMATOR_DEFAULTS, referral);
      const cols = traceColumns(c, view, query.points, ESTIMATOR_DEFAULTS.max_step_s * 1000);
      return {
        vehicle: id,
        trip,
        coolant_limit_c: model.coolant_limit_c,
        samples: raw.n,
        points: cols[0]!.length,
        method: 'lttb',
        columns: [...TRACE_COLUMNS],
        data: cols,
      };
    },
  };
}
