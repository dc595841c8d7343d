import { z } from 'zod';
import { designPointSchema, POWERTRAINS } from './fleet.ts';
import { airsideFitSchema, CAUSES, STATUSES } from './results.ts';
import { numberField } from './validation.ts';

/**
 * The sizing routes' contract (services/api/src/routes-sizing.ts): the sizing result as
 * `thermargin sizing` writes it (core/src/sizing/fleet-sizing.ts, whose types these mirror field for
 * field; the API checks the two agree at compile time), and the calculator's request and answer.
 */

const num = z.number();
const nnum = z.number().nullable();
const ci95 = z.tuple([z.number(), z.number()]).nullable();
const band = z.enum(['ram', 'fan']);
const powertrain = z.enum(POWERTRAINS);
/** kW by percentile key (`p50`, `p95`…); null without data. */
const percentiles = z.record(z.string(), z.number()).nullable();

export const spreadSchema = z
  .object({ vehicles: z.number().int(), min: num, p25: num, median: num, p75: num, max: num })
  .nullable();

const heatDistribution = z.object({
  label: z.string(),
  from: nnum,
  to: nnum,
  hours: num,
  heat_kw: percentiles,
  heat_kw_max: nnum,
});
const timeAbove = z.object({ share_of_design: num, heat_kw: nnum, hours: num, share_of_time: num });
export const dutyCycleSchema = z.object({
  overall: heatDistribution,
  by_speed: z.array(heatDistribution),
  by_ambient: z.array(heatDistribution),
  time_above: z.array(timeAbove),
});
export type DutyCycleView = z.infer<typeof dutyCycleSchema>;

const derateDay = z.object({ date: z.string(), events: num, hours: num, energy_not_delivered_kwh: num });
const derateTotals = z.object({
  events: num,
  hours: num,
  of_hours: num,
  energy_not_delivered_kwh: num,
  days: z.array(derateDay),
});
const groupTotals = derateTotals.omit({ days: true });

const bandFieldK = z.object({
  band,
  trips: num,
  k_w_m2k: nnum,
  k_ci95: ci95,
  k_clean_w_m2k: nnum,
  bench_k_w_m2k: nnum,
  ratio: nnum,
  ratio_ci95: ci95,
  clean_ratio: nnum,
});
const foulingSegment = z.object({
  starts_at: z.enum(['maintenance', 'data']),
  start: z.string(),
  end: z.string(),
  trips: num,
  km: num,
  k0_w_m2k: num,
  loss_pct_per_month: num,
  loss_pct_per_month_ci95: ci95,
  loss_pct_per_1000km: nnum,
});
const bandFouling = z.object({
  band,
  segments: z.array(foulingSegment),
  /** Trips left out of the fit because a cause other than fouling was named by then (results.ts CAUSES). */
  left_out_trips: num.optional(),
  left_out_from: z.string().nullable().optional(),
  left_out_cause: z.enum(CAUSES).nullable().optional(),
  loss_pct_per_month: nnum,
  loss_pct_per_1000km: nnum,
  k_clean_w_m2k: nnum,
  inspect_ratio: nnum,
  inspect_basis: z.enum(['health', 'margin']).nullable(),
  days_to_inspect: nnum,
  km_to_inspect: nnum,
  fouling_allowance: nnum,
  /** Why no allowance although k was fitted (above the plausible bound); null otherwise. */
  fouling_allowance_note: z.string().nullable().optional(),
});

/** core/src/sizing/calculator.ts DesignAnswer. */
export const designAnswerSchema = z.object({
  itd_k: num,
  k_fouled_w_m2k: num,
  required_area_m2: num,
  area_m2: nnum,
  supported_heat_kw: nnum,
  supported_ambient_c: nnum,
  margin_pct: nnum,
});
const designCheck = designAnswerSchema.extend({
  band,
  k_source: z.enum(['field_clean', 'field_median', 'bench']),
  k_design_w_m2k: num,
  fouling_allowance: num,
  allowance_source: z.enum(['fouling_fit', 'default']),
  /** Why the default allowance although k was fitted; null otherwise. */
  allowance_note: z.string().nullable().optional(),
  /** %: the margin `thermargin analyze` reports now, and the status and cause named now. */
  margin_now_pct: nnum.optional(),
  status_now: z.enum(STATUSES).optional(),
  cause_now: z.enum(CAUSES).optional(),
  /** %: the installed area's margin with k_design_w_m2k and no allowance. */
  margin_design_k_pct: nnum.optional(),
});
export const whatIfVehicleSchema = derateTotals.extend({
  ambient_rise_k: num,
  limit_drop_k: num,
  coolant_limit_c: num,
  design_ambient_c: num,
  hours_not_replayed: num,
});
const vehicleSizing = z.object({
  id: z.string(),
  type: z.string(),
  powertrain,
  radiator_area_m2: num,
  coolant_limit_c: num,
  design: designPointSchema,
  trips: num,
  km: num,
  field_k: z.array(bandFieldK),
  fouling: z.array(bandFouling),
  design_check: designCheck.nullable(),
  duty_cycle: dutyCycleSchema.nullable(),
  derate: derateTotals
    .extend({ share_of_time: num, onset_heat_kw: percentiles, heat_kw_while_derated: percentiles })
    .nullable(),
  what_if: z.array(whatIfVehicleSchema).nullable(),
  /** The air side the vehicle stage learned; absent in results from before it. */
  airside_fit: airsideFitSchema.nullable().optional(),
});
export type VehicleSizingView = z.infer<typeof vehicleSizing>;

export const groupWhatIfSchema = groupTotals.extend({
  ambient_rise_k: num,
  limit_drop_k: num,
  vehicles_derated: z.array(z.object({ id: z.string(), hours: num, days: num })),
});
export type GroupWhatIfView = z.infer<typeof groupWhatIfSchema>;
const groupSizing = z.object({
  group: z.string(),
  vehicles: z.array(z.string()),
  field_k: z.array(z.object({ band, k_w_m2k: spreadSchema, ratio: spreadSchema, clean_ratio: spreadSchema })),
  fouling: z.array(
    z.object({
      band,
      loss_pct_per_month: spreadSchema,
      loss_pct_per_1000km: spreadSchema,
      days_to_inspect: spreadSchema,
      fouling_allowance: spreadSchema,
    }),
  ),
  required_vs_installed: spreadSchema,
  duty_cycle: dutyCycleSchema.nullable(),
  derate: groupTotals.extend({ onset_heat_kw: percentiles }).nullable(),
  what_if: z.array(groupWhatIfSchema).nullable(),
});
export type GroupSizingView = z.infer<typeof groupSizing>;

const dutySchema = z.object({
  mass_kg: num,
  cda_m2: num,
  crr: num,
  speed_kmh: num,
  grade_pct: num.optional(),
  accel_ms2: num.optional(),
  air_density_kg_m3: num.optional(),
  ambient_c: num,
});
/** core/src/sizing/drivetrain-compare.ts DrivetrainComparison. */
const dutySource = z.enum(['given', 'fleet_data', 'default']);
export const drivetrainComparisonSchema = z.object({
  duty: dutySchema,
  /** Where each figure of the duty came from, and how the fleet's were read (core/src/sizing/fleet-duty.ts). */
  duty_source: z
    .object({
      mass_kg: dutySource,
      cda_m2: dutySource,
      crr: dutySource,
      speed_kmh: dutySource,
      ambient_c: dutySource,
    })
    .optional(),
  duty_note: z.string().optional(),
  aero_kw: num,
  rolling_kw: num,
  wheel_kw: num,
  k_w_m2k: num,
  fouling_allowance: num,
  rows: z.array(
    z.object({
      powertrain,
      drivetrain_efficiency: num,
      energy_input_kw: num,
      heat_to_coolant_kw: num,
      coolant_limit_c: num,
      itd_k: num,
      required_area_m2: num,
      area_vs_ice: num,
    }),
  ),
});
export type DrivetrainComparisonView = z.infer<typeof drivetrainComparisonSchema>;

const whatIfScenario = z.object({ ambient_rise_k: num, limit_drop_k: num });
export const sizingResultSchema = z.object({
  schema: z.literal('thermargin.sizing/1'),
  period: z.object({
    first_trip: z.string().nullable(),
    last_trip: z.string().nullable(),
    trips: num,
    samples: num,
  }),
  options: z.object({
    speed_edges_kmh: z.array(num),
    ambient_edges_c: z.array(num),
    heat_levels_share: z.array(num),
    percentiles: z.array(num),
    demand_tau_s: num,
    min_fouling_trips: num,
    min_fouling_span_days: num,
    cleaning_interval_days: num,
    default_fouling_allowance: num,
    max_fouling_allowance: num.optional(),
    fan_full_within_k: num,
    derate_release_k: num,
    what_if: z.array(whatIfScenario),
  }),
  vehicles: z.array(vehicleSizing),
  types: z.array(groupSizing),
  fleet: groupSizing,
  drivetrains: drivetrainComparisonSchema,
  method: z.array(z.object({ topic: z.string(), text: z.string(), source: z.string() })).readonly(),
  /** The core's air-side defaults, beside each vehicle's learned figures. */
  airside_defaults: z
    .object({ ram_face_ratio: num, fan_face_velocity_ms: num, velocity_exponent: num })
    .optional(),
});
export type SizingResultView = z.infer<typeof sizingResultSchema>;

// ---- GET /api/sizing (viewer): the fleet's sizing figures from the stores
export const sizingResponseSchema = z.object({
  /** When the figures were computed (they are kept until new trip results or a fleet change). */
  computed_at: z.string(),
  /** Stored trips whose samples are gone (retention): in the trip figures, not the sample ones. */
  trips_without_samples: z.number().int(),
  /** Exactly the figures `thermargin sizing` writes for the same fleet file and samples (its caution and design note are the fields beside this one). */
  sizing: sizingResultSchema,
  safety_caution: z.string(),
  /** Field figures support, and never replace, validation testing and engineering sign-off. */
  design_note: z.string(),
});
export type SizingResponse = z.infer<typeof sizingResponseSchema>;

// ---- POST /api/sizing/calculator (viewer): one design question
const finite = numberField;
export const calculatorBodySchema = z
  .strictObject({
    design: z.strictObject({
      /** °C: design (hottest-day) ambient. */
      ambient_c: finite('ambient_c').min(-40).max(60),
      heat_kw: finite('heat_kw').gt(0, 'must be > 0').max(2000),
      coolant_limit_c: finite('coolant_limit_c').min(40).max(150),
      /** –: extra area for fouling (0.15 = 15 %); absent: the fleet's fitted allowance, else the default. */
      fouling_allowance: finite('fouling_allowance').min(0).max(1).optional(),
      /** m²: a net area to test; absent: only the required area. */
      area_m2: finite('area_m2').gt(0, 'must be > 0').max(20).optional(),
      /** W/(m²·K): k to use; absent: the median field k at the design air condition. */
      k_w_m2k: finite('k_w_m2k').gt(0, 'must be > 0').max(10_000).optional(),
      /** Whose field k and allowance are taken: vehicles of this powertrain (default: the fleet). */
      powertrain: powertrain.optional(),
    }),
    /** The drivetrain comparison's duty; absent fields from the fleet's own duty, ambient from the design. */
    duty: z
      .strictObject({
        speed_kmh: finite('speed_kmh').gt(0, 'must be > 0').max(250),
        mass_kg: finite('mass_kg').gt(0, 'must be > 0').max(60_000),
        cda_m2: finite('cda_m2').gt(0, 'must be > 0').max(20),
        crr: finite('crr').min(0).max(0.05),
        grade_pct: finite('grade_pct').min(-15).max(15),
      })
      .partial()
      .optional(),
    /** Replay the fleet's recorded days with this hotter ambient and/or tighter coolant limit. */
    what_if: z
      .strictObject({
        ambient_rise_k: finite('ambient_rise_k').min(-20).max(30),
        limit_drop_k: finite('limit_drop_k').min(-20).max(40),
      })
      .optional(),
  })
  .refine((b) => b.design.coolant_limit_c > b.design.ambient_c, {
    path: ['design', 'coolant_limit_c'],
    message: 'must be above design.ambient_c (no ITD otherwise)',
  });
export type CalculatorBody = z.infer<typeof calculatorBodySchema>;

const basisSource = z.enum(['given', 'field', 'default']);
export const calculatorResponseSchema = z.object({
  basis: z.object({
    k_w_m2k: num,
    k_source: basisSource,
    fouling_allowance: num,
    allowance_source: basisSource,
    /** Vehicles whose field figures went in. */
    vehicles: z.array(z.string()),
  }),
  design: designAnswerSchema,
  drivetrains: drivetrainComparisonSchema,
  what_if: z
    .object({
      fleet: groupWhatIfSchema,
      /** Per vehicle, most hours derated first; vehicles that never derated have hours 0. */
      vehicles: z.array(whatIfVehicleSchema.extend({ id: z.string() })),
    })
    .nullable(),
  safety_caution: z.string(),
  /** Field figures support, and never replace, validation testing and engineering sign-off. */
  design_note: z.string(),
});
export type CalculatorResponse = z.infer<typeof calculatorResponseSchema>;
