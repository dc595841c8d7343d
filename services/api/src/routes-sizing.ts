import { answerDesign } from '@thermargin/core/sizing/calculator';
import { compareDrivetrains, type DrivetrainComparison } from '@thermargin/core/sizing/drivetrain-compare';
import { DEFAULT_COMPARISON_K_W_M2K, type SizingResult } from '@thermargin/core/sizing/fleet-sizing';
import { median } from '@thermargin/core/stats/quantile';
import { DESIGN_NOTE, safetyCaution } from '@thermargin/shared';
import type {
  CalculatorBody,
  CalculatorResponse,
  SizingResponse,
  SizingResultView,
} from '@thermargin/shared/sizing-api';
import type { ApiContext } from './context.ts';
import { HttpError } from './http-error.ts';
import type { Handlers } from './route.ts';
import { SizingCache } from './sizing-figures.ts';

/** Compile-time check that the documented schema describes what core returns. */
const asView = (s: SizingResult): SizingResultView => s;

/** A RangeError of core (a duty without wheel power, a limit drop below a thermostat) as a 400 on `where`. */
async function refusedAs<T>(where: string, work: () => Promise<T> | T): Promise<T> {
  try {
    return await work();
  } catch (e) {
    if (e instanceof RangeError)
      throw new HttpError(400, 'bad_request', 'body is not valid', [
        { where: `body: ${where}`, rule: e.message },
      ]);
    throw e;
  }
}

/** The field basis of a design question: median k and fitted allowance of the chosen vehicles. */
function basis(sizing: SizingResult, d: CalculatorBody['design']): CalculatorResponse['basis'] {
  const checked = sizing.vehicles.filter(
    (v) => v.design_check !== null && (d.powertrain === undefined || v.powertrain === d.powertrain),
  );
  const ks = checked.map((v) => v.design_check!.k_design_w_m2k);
  const fitted = checked
    .filter((v) => v.design_check!.allowance_source === 'fouling_fit')
    .map((v) => v.design_check!.fouling_allowance);
  return {
    k_w_m2k: d.k_w_m2k ?? (ks.length ? median(ks) : DEFAULT_COMPARISON_K_W_M2K),
    k_source: d.k_w_m2k !== undefined ? 'given' : ks.length ? 'field' : 'default',
    fouling_allowance:
      d.fouling_allowance ?? (fitted.length ? median(fitted) : sizing.options.default_fouling_allowance),
    allowance_source: d.fouling_allowance !== undefined ? 'given' : fitted.length ? 'field' : 'default',
    vehicles: checked.map((v) => v.id),
  };
}

function whatIfAnswer(r: SizingResult, s: { ambient_rise_k: number; limit_drop_k: number }) {
  const i = r.options.what_if.findIndex(
    (x) => x.ambient_rise_k === s.ambient_rise_k && x.limit_drop_k === s.limit_drop_k,
  );
  const vehicles = r.vehicles
    .filter((v) => v.what_if !== null)
    .map((v) => ({ id: v.id, ...v.what_if![i]! }))
    .sort((a, b) => b.hours - a.hours || a.id.localeCompare(b.id));
  return { fleet: r.fleet.what_if![i]!, vehicles };
}

/** The sizing loop on the API: the fleet's figures and the interactive calculator. */
export function sizingRoutes(x: ApiContext): Handlers<'sizing' | 'calculator'> {
  const cache = new SizingCache(x.deps, x.clock);
  const fleetCaution = () => safetyCaution(x.deps.fleet.current().input.vehicles.map((v) => v.powertrain));
  return {
    sizing: async (): Promise<SizingResponse> => {
      const f = await cache.get();
      return {
        computed_at: new Date(f.computed_ms).toISOString(),
        trips_without_samples: f.trips_without_samples,
        sizing: asView(f.sizing),
        safety_caution: fleetCaution(),
        design_note: DESIGN_NOTE,
      };
    },
    calculator: async ({ body }): Promise<CalculatorResponse> => {
      const { sizing } = await cache.get();
      const b = basis(sizing, body.design);
      const d = body.design;
      const design = await refusedAs('design', () =>
        answerDesign({
          ambient_c: d.ambient_c,
          heat_kw: d.heat_kw,
          coolant_limit_c: d.coolant_limit_c,
          k_w_m2k: b.k_w_m2k,
          fouling_allowance: b.fouling_allowance,
          ...(d.area_m2 === undefined ? {} : { area_m2: d.area_m2 }),
        }),
      );
      // The fleet's own duty (as the sizing figures read it), the figures asked for, the design's ambient.
      const fleet = sizing.drivetrains;
      const drivetrains: DrivetrainComparison = await refusedAs('duty', () => ({
        ...compareDrivetrains(
          { ...fleet.duty, ...body.duty, ambient_c: d.ambient_c },
          b.k_w_m2k,
          b.fouling_allowance,
        ),
        ...(fleet.duty_source && {
          duty_source: {
            ...fleet.duty_source,
            ...Object.fromEntries(Object.keys(body.duty ?? {}).map((k) => [k, 'given'])),
            ambient_c: 'given',
          },
          duty_note: fleet.duty_note,
        }),
      }));
      const w = body.what_if;
      const what_if = w
        ? whatIfAnswer(await refusedAs('what_if.limit_drop_k', () => cache.whatIf(w)), w)
        : null;
      return {
        basis: b,
        design,
        drivetrains,
        what_if,
        safety_caution: fleetCaution(),
        design_note: DESIGN_NOTE,
      };
    },
  };
}
