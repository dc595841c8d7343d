import { median } from '../stats/quantile.ts';
import { theilSen } from '../stats/theil-sen.ts';

export interface Level {
  /** Current level at the last point. */
  value: number;
  /** Standard error of `value` in units of the trip noise σ. */
  se_per_sigma: number;
  /** Units per day when the Theil–Sen slope is significant at 95 % (Sen's interval excludes 0), else null. */
  slope_per_day: number | null;
}

/** 1.2533 = √(π/2): asymptotic efficiency loss of the median against the mean for normal data. */
const MEDIAN_SE = 1.2533;
/** Points below which a line's endpoint (variance ≈ 4σ²/n) is too loose to beat the median's lag. */
const MIN_MOVING = 12;

/**
 * Current level of a short series: the Theil–Sen line's value at the last point when the series is
 * known to move (`moving`: a change detector signals) or its slope is significant, else the median
 * (a line adds endpoint variance, about 4σ²/n, that a flat series does not need, while a median lags
 * a moving series by half its window). `x_days` ascending.
 */
export function currentLevel(x_days: readonly number[], y: readonly number[], moving = false): Level {
  const n = y.length;
  if (n === 0) throw new RangeError('currentLevel: empty series');
  const flat = (): Level => ({
    value: median(y),
    se_per_sigma: MEDIAN_SE / Math.sqrt(n),
    slope_per_day: null,
  });
  if (n < 6 || x_days[n - 1]! === x_days[0]!) return flat();
  const f = theilSen(x_days, y);
  const ci = f.slope_ci95;
  const significant = ci !== null && (ci[0] > 0 || ci[1] < 0);
  if (!significant && !(moving && n >= MIN_MOVING)) return flat();
  return {
    value: f.intercept + f.slope * x_days[n - 1]!,
    se_per_sigma: 2 / Math.sqrt(n),
    slope_per_day: significant ? f.slope : null,
  };
}
