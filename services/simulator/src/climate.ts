import { DAY_MS } from '@thermargin/shared/time';
import { hashKey } from '@thermargin/core/stats/prng';

/**
 * Ambient air temperature of the scenario's town, by season, time of day and weather:
 *   T(t) = mean + ½·annual_swing·cos(2π·(t − hottest)/year) + ½·daily_swing·cos(2π·(hour − 15)/24) + w(t)
 * The daily maximum falls at 15:00 local time (common practice: 2–4 h after solar noon). w(t) is a
 * day-to-day weather offset, smooth in time (linear between day midpoints), each day's value drawn from
 * the seed and the day number alone so any instant can be evaluated without stepping through earlier days.
 */
export interface ClimateOptions {
  /** °C, 22: annual mean of the daily mean. */
  annual_mean_c: number;
  /** K, 20: hottest-week daily mean minus coldest-week daily mean. */
  annual_swing_k: number;
  /** K, 12: daily maximum minus daily minimum. */
  daily_swing_k: number;
  /** K, 2.5: standard deviation of the day-to-day weather offset. */
  weather_sd_k: number;
  /** h, 0: local time minus UTC. */
  utc_offset_h: number;
  /** epoch ms or null (default): the middle of the hottest week; null puts it 7 days before the history ends,
   *  so the history is in the hot season whatever the injected clock says. */
  hottest_ms: number | null;
}

export const CLIMATE_DEFAULTS: Readonly<ClimateOptions> = Object.freeze({
  annual_mean_c: 22,
  annual_swing_k: 20,
  daily_swing_k: 12,
  weather_sd_k: 2.5,
  utc_offset_h: 0,
  hottest_ms: null,
});

const YEAR_MS = 365.25 * DAY_MS;

export type Climate = (t_ms: number) => number;

/** Standard normal from a 32-bit hash (inverse-CDF-free: sum of 4 uniforms, rescaled; smooth enough for weather). */
function hashNormal(h: number): number {
  let s = 0;
  for (let i = 0; i < 4; i++) {
    h = Math.imul(h ^ (h >>> 15), 0x2c1b3c6d) >>> 0;
    h = (h ^ (h >>> 12)) >>> 0;
    s += h / 4294967296;
  }
  return (s - 2) * Math.sqrt(3);
}

/** The town's true ambient temperature as a function of time; `hottest_ms` resolved by the caller. */
export function createClimate(o: ClimateOptions & { hottest_ms: number }, seed: number): Climate {
  const offset_ms = o.utc_offset_h * 3_600_000;
  const weather = (day: number) => o.weather_sd_k * hashNormal(hashKey(seed, 'weather', day));
  return (t_ms) => {
    const local = t_ms + offset_ms;
    const hour = (local % DAY_MS) / 3_600_000;
    const d = local / DAY_MS - 0.5;
    const d0 = Math.floor(d);
    const f = d - d0;
    const w = (1 - f) * weather(d0) + f * weather(d0 + 1);
    return (
      o.annual_mean_c +
      0.5 * o.annual_swing_k * Math.cos((2 * Math.PI * (t_ms - o.hottest_ms)) / YEAR_MS) +
      0.5 * o.daily_swing_k * Math.cos((2 * Math.PI * (hour - 15)) / 24) +
      w
    );
  };
}
