import type {
  AlertView,
  FleetReloadResponse,
  MaintenanceBody,
  MaintenanceResponse,
} from '@thermargin/shared';
import { InputError } from '@thermargin/shared';
import type { Actor } from '@thermargin/store/workflow';
import { assessAndCommit } from '@thermargin/usecases/commit';
import type { LoadedFleet } from '@thermargin/usecases/fleet-file';
import type { ApiContext } from './context.ts';
import { HttpError, notFound } from './http-error.ts';
import type { Handlers } from './route.ts';
import { alertViews, maintenanceViews } from './views.ts';

type WriteRoute =
  | 'acknowledgeAlert'
  | 'closeAlert'
  | 'logMaintenance'
  | 'reloadFleet'
  | 'replaceFleet'
  | 'tokens'
  | 'createToken'
  | 'revokeToken'
  | 'audit';

/** The few writes: alert actions, maintenance, the fleet file, tokens, and the audit log that records them. */
export function writeRoutes(x: ApiContext): Handlers<WriteRoute> {
  const { deps } = x;
  return {
    acknowledgeAlert: ({ params, body, actor }) =>
      alertAction(x, params.id, params.alert, 'acknowledge', body.note, actor),
    closeAlert: ({ params, body, actor }) =>
      alertAction(x, params.id, params.alert, 'close', body.note, actor),
    logMaintenance: ({ params, body, actor }) => logMaintenance(x, params.id, body, actor),
    reloadFleet: async ({ actor }) => swapFleet(x, () => deps.fleet.reload(), actor, 'fleet.reload'),
    replaceFleet: async ({ body, actor }) =>
      swapFleet(x, () => deps.fleet.replace(`${JSON.stringify(body, null, 2)}\n`), actor, 'fleet.replace'),
    tokens: async () => ({
      tokens: (await deps.tokens.list()).map(({ name, role, source }) => ({ name, role, source })),
    }),
    createToken: async ({ body, actor }) => {
      if ((await deps.tokens.list()).some((t) => t.name === body.name))
        throw new HttpError(409, 'conflict', `a token named ${body.name} exists`);
      return {
        name: body.name,
        role: body.role,
        token: await deps.tokens.add(body.name, body.role, actor, x.clock()),
      };
    },
    revokeToken: async ({ params, actor }) => {
      const name = params.name;
      if (deps.tokens.isConfigured(name))
        throw new HttpError(
          409,
          'conflict',
          `${name} is configured in the token file or env: remove it there`,
        );
      if (!(await deps.tokens.revoke(name, actor, x.clock()))) throw notFound(`token ${name}`);
      return { removed: name };
    },
    audit: async ({ query }) => ({ entries: await deps.workflow.readAudit(query.limit) }),
  };
}

/** Acknowledges or closes an open alert with a note; a closed one is a 409. */
async function alertAction(
  x: ApiContext,
  id: string,
  alertId: string,
  action: 'acknowledge' | 'close',
  note: string,
  actor: Actor,
): Promise<AlertView> {
  const { workflow } = x.deps;
  const data = await x.data(id);
  const find = async () =>
    alertViews(id, data.result, await workflow.alertActions(id)).find((a) => a.id === alertId);
  const alert = await find();
  if (!alert) throw notFound(`alert ${alertId} of vehicle ${id}`);
  if (alert.state === 'closed') throw new HttpError(409, 'conflict', `alert ${alert.id} is already closed`);
  await workflow.recordAlertAction(
    { vehicle: id, alert: alert.id, action, by: actor.by, at_ms: x.clock(), note },
    actor,
  );
  return (await find())!;
}

/** Records a maintenance entry and re-assesses the vehicle's stored trips with it. */
async function logMaintenance(
  x: ApiContext,
  id: string,
  body: MaintenanceBody,
  actor: Actor,
): Promise<MaintenanceResponse> {
  const { deps } = x;
  const model = x.model(id);
  const rec = await deps.workflow.addMaintenance(id, { ...body, by: actor.by }, actor, x.clock());
  if ((await deps.results.version(id)) !== undefined) {
    const extra = (await deps.workflow.maintenance(id)).map((m) => m.entry);
    await assessAndCommit(deps.results, model, extra, { trips: [] }, x.clock());
  }
  const entry = maintenanceViews(model, [rec]).find((m) => m.id === `api-${rec.id}`)!;
  return { entry, summary: await x.summary(id) };
}

/** Vehicles added, removed or whose fleet entry changed between two loads. */
function changedVehicles(a: LoadedFleet, b: LoadedFleet): string[] {
  const key = (f: LoadedFleet) =>
    new Map(f.input.vehicles.map((v) => [v.id, JSON.stringify([v, f.input.policy])]));
  const ka = key(a);
  const kb = key(b);
  return [...new Set([...ka.keys(), ...kb.keys()])].filter((id) => ka.get(id) !== kb.get(id)).sort();
}

/** Loads a new fleet (an invalid one is a 400 and changes nothing), re-analyses what changed, audits it. */
async function swapFleet(
  x: ApiContext,
  load: () => LoadedFleet,
  actor: Actor,
  action: string,
): Promise<FleetReloadResponse> {
  const { deps } = x;
  const before = deps.fleet.current();
  let after: LoadedFleet;
  try {
    after = load();
  } catch (e) {
    if (e instanceof InputError)
      throw new HttpError(400, 'bad_request', 'fleet file is not valid', e.problems);
    throw e;
  }
  const changed = changedVehicles(before, after);
  for (const vehicle of changed.filter((v) => after.models.has(v)))
    deps.analyzer
      ?.reanalyze({ vehicle })
      .catch((e) => deps.log?.('reanalyze_failed', { vehicle, error: String(e) }));
  await deps.workflow.audit(actor, action, 'fleet', `changed: ${changed.join(', ') || 'none'}`, x.clock());
  return { vehicles: after.models.size, changed };
}
