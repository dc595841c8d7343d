import {
  alertActionBodySchema,
  alertActionResponseSchema,
  type AlertActionBody,
  auditResponseSchema,
  fleetReloadResponseSchema,
  type FleetReloadResponse,
  InputError,
  maintenanceBodySchema,
  type MaintenanceBody,
  maintenanceResponseSchema,
  tokenCreateBodySchema,
  tokenCreateResponseSchema,
  tokensResponseSchema,
  type ApiRole,
} from '@thermargin/shared';
import { assessAndCommit } from '@thermargin/usecases/commit';
import type { LoadedFleet } from '@thermargin/usecases/fleet-file';
import { z } from 'zod';
import { API_DEFAULTS } from './deps.ts';
import type { ApiContext } from './context.ts';
import { HttpError, notFound } from './http-error.ts';
import { type Route, route } from './route.ts';
import { alertViews, maintenanceViews } from './views.ts';

/** Vehicles added, removed or whose fleet entry changed between two loads. */
function changedVehicles(a: LoadedFleet, b: LoadedFleet): string[] {
  const key = (f: LoadedFleet) =>
    new Map(f.input.vehicles.map((v) => [v.id, JSON.stringify([v, f.input.policy])]));
  const ka = key(a);
  const kb = key(b);
  return [...new Set([...ka.keys(), ...kb.keys()])].filter((id) => ka.get(id) !== kb.get(id)).sort();
}

const asBadRequest = (e: unknown): never => {
  if (e instanceof InputError) throw new HttpError(400, 'bad_request', 'fleet file is not valid', e.problems);
  throw e;
};

export function writeRoutes(x: ApiContext): Route[] {
  const { deps } = x;
  const alertAction = (action: 'acknowledge' | 'close') =>
    route({
      method: 'post',
      path: `/api/vehicles/:id/alerts/:alert/${action}`,
      role: 'engineer',
      summary: `${action === 'close' ? 'Close' : 'Acknowledge'} an alert with a note`,
      body: alertActionBodySchema,
      response: alertActionResponseSchema,
      handle: async ({
        params,
        body,
        actor,
      }: {
        params: Record<string, string>;
        body: AlertActionBody;
        actor: { by: string; role: ApiRole };
      }) => {
        const id = params.id!;
        const data = await x.data(id);
        const find = () =>
          alertViews(id, data.result, deps.workflow.alertActions(id)).find((a) => a.id === params.alert);
        const alert = find();
        if (!alert) throw notFound(`alert ${params.alert} of vehicle ${id}`);
        if (alert.state === 'closed')
          throw new HttpError(409, 'conflict', `alert ${alert.id} is already closed`);
        deps.workflow.recordAlertAction(
          { vehicle: id, alert: alert.id, action, by: actor.by, at_ms: x.clock(), note: body.note },
          actor,
        );
        return find();
      },
    });

  const reanalyse = (before: LoadedFleet, after: LoadedFleet): FleetReloadResponse => {
    const changed = changedVehicles(before, after);
    for (const vehicle of changed.filter((v) => after.models.has(v)))
      deps.analyzer
        ?.reanalyze({ vehicle })
        .catch((e) => deps.log?.('reanalyze_failed', { vehicle, error: String(e) }));
    return { vehicles: after.models.size, changed };
  };

  /** Loads a new fleet (an invalid one is a 400 and changes nothing), re-analyses what changed, audits it. */
  const swapFleet = (load: () => LoadedFleet, actor: { by: string; role: ApiRole }, action: string) => {
    const before = deps.fleet.current();
    let after: LoadedFleet;
    try {
      after = load();
    } catch (e) {
      asBadRequest(e);
      throw e;
    }
    const out = reanalyse(before, after);
    deps.workflow.audit(actor, action, 'fleet', `changed: ${out.changed.join(', ') || 'none'}`, x.clock());
    return out;
  };

  return [
    alertAction('acknowledge'),
    alertAction('close'),
    route({
      method: 'post',
      path: '/api/vehicles/:id/maintenance',
      role: 'engineer',
      summary: 'Log maintenance; re-baselines the bands the action affects and re-assesses the vehicle',
      body: maintenanceBodySchema,
      response: maintenanceResponseSchema,
      handle: async ({
        params,
        body,
        actor,
      }: {
        params: Record<string, string>;
        body: MaintenanceBody;
        actor: { by: string; role: ApiRole };
      }) => {
        const id = params.id!;
        const model = x.model(id);
        const rec = deps.workflow.addMaintenance(id, { ...body, by: actor.by }, actor, x.clock());
        if (deps.results.version(id) !== undefined) {
          const extra = deps.workflow.maintenance(id).map((m) => m.entry);
          await assessAndCommit(deps.results, model, extra, { trips: [] }, x.clock());
        }
        const entry = maintenanceViews(model, [rec]).find((m) => m.id === `api-${rec.id}`)!;
        return { entry, summary: await x.summary(id) };
      },
    }),
    route({
      method: 'post',
      path: '/api/fleet/reload',
      role: 'admin',
      summary: 'Re-read the fleet file; changed vehicles are re-analysed',
      response: fleetReloadResponseSchema,
      handle: async ({ actor }) => swapFleet(() => deps.fleet.reload(), actor, 'fleet.reload'),
    }),
    route({
      method: 'put',
      path: '/api/fleet',
      role: 'admin',
      summary:
        'Replace the fleet file (JSON body, validated like the file); changed vehicles are re-analysed',
      body: z.unknown(),
      max_body_bytes: API_DEFAULTS.max_fleet_bytes,
      response: fleetReloadResponseSchema,
      handle: async ({ body, actor }) =>
        swapFleet(() => deps.fleet.replace(`${JSON.stringify(body, null, 2)}\n`), actor, 'fleet.replace'),
    }),
    route({
      method: 'get',
      path: '/api/tokens',
      role: 'admin',
      summary: 'Token names and roles (never secrets or hashes)',
      response: tokensResponseSchema,
      handle: async () => ({
        tokens: deps.tokens.list().map(({ name, role, source }) => ({ name, role, source })),
      }),
    }),
    route({
      method: 'post',
      path: '/api/tokens',
      role: 'admin',
      summary: 'Create a token; its secret is in this answer only',
      body: tokenCreateBodySchema,
      response: tokenCreateResponseSchema,
      handle: async ({
        body,
        actor,
      }: {
        body: { name: string; role: ApiRole };
        actor: { by: string; role: ApiRole };
      }) => {
        if (deps.tokens.list().some((t) => t.name === body.name))
          throw new HttpError(409, 'conflict', `a token named ${body.name} exists`);
        return {
          name: body.name,
          role: body.role,
          token: deps.tokens.add(body.name, body.role, actor, x.clock()),
        };
      },
    }),
    route({
      method: 'delete',
      path: '/api/tokens/:name',
      role: 'admin',
      summary: 'Revoke a token added through the API (configured ones are removed from their file or env)',
      response: z.object({ removed: z.string() }),
      handle: async ({ params, actor }) => {
        const name = params.name!;
        if (deps.tokens.isConfigured(name))
          throw new HttpError(
            409,
            'conflict',
            `${name} is configured in the token file or env: remove it there`,
          );
        if (!deps.workflow.removeToken(name, actor, x.clock())) throw notFound(`token ${name}`);
        return { removed: name };
      },
    }),
    route({
      method: 'get',
      path: '/api/audit',
      role: 'admin',
      summary: 'The audit log of every write, newest first',
      query: z.strictObject({ limit: z.coerce.number().int().min(1).max(1000).default(100) }),
      response: auditResponseSchema,
      handle: async ({ query }: { query: { limit: number } }) => ({
        entries: deps.workflow.readAudit(query.limit),
      }),
    }),
  ];
}
