import { z } from 'zod';
import { MARGIN_SOURCES, TRENDS } from './results.ts';

/**
 * The vehicle page's chart data (GET /api/vehicles/{id} `series`), as the health module builds it
 * (core/health/series.ts). Part of the HTTP API's contract (api.ts): fields are added, never renamed.
 */

const num = z.number().nullable();
const iso = z.string();
const col = z.array(num);
export const bandSeriesSchema = z.object({
  health: col,
  level: col,
  ewma: col,
  ewma_lcl: col,
  cusum: col,
  cusum_h: z.number(),
  change_points: z.array(
    z.object({
      signal: iso,
      since: iso,
      detector: z.enum(['cusum', 'ewma', 'step']),
      /** The level at the end of the change's segment less the median health before the change began, in points (absent in results stored before it). */
      shift_pct: num.optional(),
    }),
  ),
  baselines: z.array(
    z.object({
      start: iso,
      k_w_m2k: num,
      source: z.enum(['bench', 'trips']),
      reference: num,
    }),
  ),
});

/** Chart data of the health module (core/health/series.ts): one entry per trip, by `time_ms`. */
export const healthSeriesSchema = z.object({
  time_ms: z.array(z.number()),
  ram: bandSeriesSchema,
  fan: bandSeriesSchema,
  margin: z.object({
    basis: z.enum(['ram', 'fan']),
    pct: col,
    level_pct: col,
    lat_c: col,
    lat_level_c: col,
    inspect_below_pct: z.number(),
    watch_below_pct: z.number(),
    /** Where each trip's margin comes from (results.ts MARGIN_SOURCES); absent in results stored before it. */
    source: z.array(z.enum(MARGIN_SOURCES).nullable()).optional(),
    /** The margin's trend since the governing band's last change; the tile, finding and alerts quote it. */
    trend: z
      .object({
        word: z.enum(TRENDS),
        /** Points of margin per 30 days (Theil–Sen), with Sen's 95 % interval. */
        pct_per_30d: z.number(),
        pct_per_30d_ci95: z.tuple([z.number(), z.number()]).nullable(),
        since: iso,
        trips: z.number().int(),
      })
      .nullable()
      .optional(),
  }),
  projection: z.object({
    method: z.enum(['kern-seaton', 'theil-sen']).nullable(),
    threshold_pct: z.number(),
    date: iso.nullable(),
    interval: z.tuple([iso.nullable(), iso.nullable()]).nullable(),
    curve: z.object({
      time_ms: z.array(z.number()),
      margin_pct: z.array(z.number()),
      lat_c: z.array(z.number()),
    }),
    reason: z.string().nullable(),
  }),
});
export type HealthSeriesView = z.infer<typeof healthSeriesSchema>;
