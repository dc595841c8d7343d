import { z } from 'zod';

/** Why a band has no k on a trip, in words a practitioner can act on. */
const reason = z.string();
const ci95 = z.tuple([z.number(), z.number()]);
const nullableNumber = z.number().nullable();

export const STATUSES = ['ok', 'watch', 'inspect'] as const;
export type Status = (typeof STATUSES)[number];
export const CAUSES = ['none', 'fouling', 'fan', 'coolant_flow', 'sensor'] as const;
export type Cause = (typeof CAUSES)[number];
/** The causes in words, for alerts and screens (the codes stay in data and the CLI's columns). */
export const CAUSE_WORD: Record<Cause, string> = {
  none: 'no fault found',
  fouling: 'radiator fouling',
  fan: 'fan fault',
  coolant_flow: 'low coolant flow',
  sensor: 'sensor fault',
};

/** Direction of the margin since its last step (core/health/trend.ts). */
export const TRENDS = ['falling', 'steady', 'rising'] as const;
export type Trend = (typeof TRENDS)[number];

/**
 * Where a vehicle result's per-trip margin comes from: `trip`, the trip's own k in the band that
 * governs the design point; `band_level`, that band's current level (the trip gave it no k, or a
 * flagged one); `other_band`, the trip's k in the other band moved along the air-side model, while the
 * governing band has no level yet (margin_basis then names the other band).
 */
export const MARGIN_SOURCES = ['trip', 'band_level', 'other_band'] as const;
export type MarginSource = (typeof MARGIN_SOURCES)[number];
/**
 * One band's accepted windows on a trip (core/trip/windows.ts): what each window's k is made of, kept so
 * the vehicle stage can refer them again with the air-side shape, unmeasured heat and ambient
 * correction it learns from all the vehicle's trips (core/vehicle/learn.ts). Same length arrays.
 */
export const bandWindowsSchema = z.object({
  /** km/h: the window's vehicle speed, root mean square weighted by ITD. */
  speed_kmh: z.array(z.number()),
  /** %: the window's fan duty, root mean square weighted by ITD. */
  fan_pct: z.array(z.number()),
  /** K: mean ITD as measured (coolant_in − ambient). */
  itd_k: z.array(z.number()),
  /** kW: heat generated less heat stored (C·dT/dt); null where the window was not near-steady. */
  balance_kw: z.array(z.number().nullable()),
  /** kW: heat rejected from the coolant flow meter (ρ·cp·V̇·ΔT); null where the window had none. */
  meter_kw: z.array(z.number().nullable()),
  /** L/min: mean coolant flow where the flow meter gave the heat; null elsewhere. */
  flow_lpm: z.array(z.number().nullable()),
});
export type BandWindowsEvidence = z.infer<typeof bandWindowsSchema>;

/** The ambient-dependent figures of a trip before its ambient correction (kept beside the corrected ones). */
export const uncorrectedSchema = z.object({
  k_ram_w_m2k: nullableNumber,
  k_fan_w_m2k: nullableNumber,
  margin_pct: nullableNumber,
  limiting_ambient_c: nullableNumber,
});

/** Per-trip result of the core computation (see core/trip/analyze-trip.ts). */
export const tripResultSchema = z.object({
  trip: z.string(),
  start: z.string(),
  end: z.string(),
  samples: z.number().int(),
  rejected: z.number().int(),
  distance_km: z.number(),
  k_ram_w_m2k: nullableNumber,
  k_ram_ci95: ci95.nullable(),
  n_ram: z.number().int(),
  k_ram_reason: reason.nullable(),
  k_fan_w_m2k: nullableNumber,
  k_fan_ci95: ci95.nullable(),
  n_fan: z.number().int(),
  k_fan_reason: reason.nullable(),
  heat_kw_mean: z.number(),
  heat_kw_p95: z.number(),
  heat_kw_max: z.number(),
  heat_kwh: z.number(),
  derate_s: z.number(),
  coolant_max_c: z.number(),
  ambient_max_c: z.number(),
  margin_pct: nullableNumber,
  limiting_ambient_c: nullableNumber,
  margin_basis: z.enum(['ram', 'fan']).nullable(),
  /** Evidence the health module reads (see core/trip/evidence.ts). */
  ambient_mean_c: z.number(),
  /** K: coolant_in − ambient at key-on after a stop of ≥ 6 h (a soaked loop reads ambient); null otherwise. */
  soak_offset_k: nullableNumber,
  /** Share (0–1) of the trip's time with the fan at ≥ 95 % duty. */
  fan_saturated_share: z.number(),
  /** K/kW: median radiator temperature drop per kW rejected over valid windows; null without an outlet sensor. */
  coolant_dt_per_kw: nullableNumber,
  /** Signals that looked stuck or spiky on this trip, in words (e.g. "coolant_in_c stuck at 81.0 for 42 min"). */
  sensor_flags: z.array(z.string()),
  /** Each band's accepted windows; absent in results written before they were kept. */
  windows: z.object({ ram: bandWindowsSchema, fan: bandWindowsSchema }).optional(),
  /** K added to the measured ambient for k, margin and limiting ambient (the vehicle's confirmed
   *  soak-check offset, core/trip/ambient-offset.ts); absent when none was applied. */
  ambient_correction_k: z.number().optional(),
  /** The figures without the ambient correction; present exactly when ambient_correction_k is. */
  uncorrected: uncorrectedSchema.optional(),
  health_ram: nullableNumber.optional(),
  health_fan: nullableNumber.optional(),
  status: z.enum(STATUSES).optional(),
  /** The cause named after this trip, once the vehicle is assessed ('none' while none is). */
  cause: z.enum(CAUSES).optional(),
  /**
   * Set once the vehicle is assessed: margin_pct, limiting_ambient_c and margin_basis then hold the
   * design-point margin from the governing band (see MARGIN_SOURCES), and these the trip's own figures
   * from its k as the trip analysis gave them.
   */
  margin_source: z.enum(MARGIN_SOURCES).nullable().optional(),
  trip_margin_pct: nullableNumber.optional(),
  trip_limiting_ambient_c: nullableNumber.optional(),
  trip_margin_basis: z.enum(['ram', 'fan']).nullable().optional(),
  /**
   * true: the trip is shorter than one estimation window, too short to judge; it is listed but left out
   * of the vehicle's assessment (no health, no status).
   */
  too_short: z.boolean().optional(),
});
export type TripResult = z.infer<typeof tripResultSchema>;

/** A trip result without its window evidence: what screens and reports show (the evidence is for the vehicle stage). */
export function withoutWindows(t: TripResult): TripResult {
  const { windows: _, ...rest } = t;
  return rest;
}

/** Where a learned figure came from: fitted to the vehicle's own data, the fleet file, or the default. */
export const FIGURE_BASES = ['fitted', 'fleet_file', 'default'] as const;
export const fittedFigureSchema = z.object({
  value: z.number(),
  /** 95 % interval of a fitted value; null when the figure was not fitted. */
  ci95: ci95.nullable(),
  basis: z.enum(FIGURE_BASES),
});

/** The vehicle's air-side shape as the vehicle stage learned it (core/radiator/airside-fit.ts). */
export const airsideFitSchema = z.object({
  velocity_exponent: fittedFigureSchema,
  /** The exponent in the fan band (k follows face velocity more steeply at low air flow). */
  fan_velocity_exponent: fittedFigureSchema,
  ram_face_ratio: fittedFigureSchema,
  /** Not identified by k apart from the ram ratio (only their ratio is): always the prior. */
  fan_face_velocity_ms: fittedFigureSchema,
  windows: z.number().int(),
  trips: z.number().int(),
  /** Why figures kept the fleet file's value or the default, in words. */
  notes: z.array(z.string()),
});
export type AirsideFit = z.infer<typeof airsideFitSchema>;
export type FittedFigure = z.infer<typeof fittedFigureSchema>;

/** Unmeasured steady heat into the loop: fitted (used), the fleet file's aux_heat_kw, or none. */
export const unmeasuredHeatSchema = z.object({
  /** kW used in the heat balance: fitted, the fleet file's aux_heat_kw, or 0. */
  value_kw: z.number(),
  ci95: ci95.nullable(),
  basis: z.enum(['fitted', 'fleet_file', 'none']),
  /** Trips with flow-meter windows the estimate rests on. */
  trips: z.number().int(),
  /** Why it is not fitted, in words. */
  reason: z.string().nullable(),
});

/** The ambient offset of one sensor period from key-on soak checks (core/trip/ambient-offset.ts). */
export const ambientOffsetSchema = z.object({
  /** Start of the period (a sensor_replaced entry); null for the first. */
  from: z.string().nullable(),
  value_k: nullableNumber,
  ci95: ci95.nullable(),
  checks: z.number().int(),
  /** Whether the trips of the period were corrected (ambient_correction_k). */
  applied: z.boolean(),
  reason: z.string().nullable(),
});

export const alertSchema = z.object({
  time: z.string(),
  status: z.enum(STATUSES),
  cause: z.enum(CAUSES),
  detail: z.string(),
});
export type Alert = z.infer<typeof alertSchema>;

export const vehicleResultSchema = z.object({
  id: z.string(),
  trips: z.array(tripResultSchema),
  health: z.object({ ram: nullableNumber, fan: nullableNumber }).optional(),
  status: z.enum(STATUSES).optional(),
  cause: z.enum(CAUSES).optional(),
  cause_evidence: z.string().optional(),
  projected_inspect_date: z.string().nullable().optional(),
  /** Calendar days (UTC) projected_inspect_date lies before the vehicle's latest trip end: overdue; null when ahead or none. */
  projected_inspect_overdue_days: z.number().int().nullable().optional(),
  /** %, °C: the current margin level at the design point and its limiting ambient (not one trip's). */
  margin_pct: nullableNumber.optional(),
  limiting_ambient_c: nullableNumber.optional(),
  /** The band whose k governs the design point. */
  margin_basis: z.enum(['ram', 'fan']).optional(),
  /** The margin's trend since the governing band's last step, and its rate in points per 30 days. */
  trend: z.enum(TRENDS).nullable().optional(),
  trend_pct_per_30d: nullableNumber.optional(),
  alerts: z.array(alertSchema).optional(),
  /** Why the vehicle has no status: no usable data (its refusals in words), never a silent `ok`. */
  unassessed: z.string().optional(),
  airside_fit: airsideFitSchema.optional(),
  unmeasured_heat: unmeasuredHeatSchema.optional(),
  ambient_offset: z.array(ambientOffsetSchema).optional(),
});
export type VehicleResult = z.infer<typeof vehicleResultSchema>;

export const rejectedSummarySchema = z.object({
  total: z.number().int(),
  by_reason: z.record(z.string(), z.number().int()),
});
export type RejectedSummary = z.infer<typeof rejectedSummarySchema>;

export const analysisReportSchema = z.object({
  vehicles: z.array(vehicleResultSchema),
  rejected: rejectedSummarySchema,
});
export type AnalysisReport = z.infer<typeof analysisReportSchema>;
