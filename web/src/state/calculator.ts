import { median } from '@thermargin/core/stats/quantile';
import type { Powertrain } from '@thermargin/shared/fleet';
import type { CalculatorBody, SizingResultView } from '@thermargin/shared/sizing-api';

/** The calculator's inputs as typed (text, so a half-typed number stays as it is). */
export interface CalculatorForm {
  ambient_c: string;
  heat_kw: string;
  coolant_limit_c: string;
  /** % (blank: the fleet's fitted allowance). */
  fouling_pct: string;
  area_m2: string;
  /** Blank: the field k. */
  k_w_m2k: string;
  powertrain: Powertrain | '';
  speed_kmh: string;
  mass_kg: string;
  ambient_rise_k: string;
  limit_drop_k: string;
}

const text = (x: number | undefined): string => (x === undefined || !Number.isFinite(x) ? '' : String(x));

/** Starting inputs: the fleet's typical vehicle (median design point, limit and area), its own duty
 *  and its first what-if scenario. */
export function defaultForm(s: SizingResultView): CalculatorForm {
  const vs = s.vehicles;
  const of = (f: (v: (typeof vs)[number]) => number) => (vs.length ? median(vs.map(f)) : undefined);
  const scenario = s.options.what_if[1] ?? s.options.what_if[0];
  return {
    ambient_c: text(of((v) => v.design.ambient_c)),
    heat_kw: text(of((v) => v.design.heat_kw)),
    coolant_limit_c: text(of((v) => v.coolant_limit_c)),
    fouling_pct: '',
    area_m2: text(of((v) => v.radiator_area_m2)),
    k_w_m2k: '',
    powertrain: '',
    // Blank: the fleet's own duty (the sizing figures'), which the inputs show as their hint.
    speed_kmh: '',
    mass_kg: '',
    ambient_rise_k: text(scenario?.ambient_rise_k),
    limit_drop_k: text(scenario?.limit_drop_k),
  };
}

/** Blank → absent; anything else as a number (NaN goes as null, which the API names as not a number). */
const value = (s: string): number | undefined => (s.trim() === '' ? undefined : Number(s));
const present = <T extends Record<string, unknown>>(o: T): Partial<T> =>
  Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;

/** The request body for the form; the API validates it (and says which field breaks which rule). */
export function calculatorBody(f: CalculatorForm): CalculatorBody {
  const fouling = value(f.fouling_pct);
  const rise = value(f.ambient_rise_k);
  const drop = value(f.limit_drop_k);
  return {
    design: {
      ...(present({
        ambient_c: value(f.ambient_c),
        heat_kw: value(f.heat_kw),
        coolant_limit_c: value(f.coolant_limit_c),
        fouling_allowance: fouling === undefined ? undefined : fouling / 100,
        area_m2: value(f.area_m2),
        k_w_m2k: value(f.k_w_m2k),
      }) as CalculatorBody['design']),
      ...(f.powertrain ? { powertrain: f.powertrain } : {}),
    },
    duty: present({ speed_kmh: value(f.speed_kmh), mass_kg: value(f.mass_kg) }),
    ...(rise === undefined && drop === undefined
      ? {}
      : { what_if: { ambient_rise_k: rise ?? 0, limit_drop_k: drop ?? 0 } }),
  };
}
