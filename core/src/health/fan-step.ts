import type { BandMonitor } from './band-monitor.ts';
import { FAN_OVER_RAM, type FanStep } from './causes.ts';

/**
 * Of the fan band's changes since its baseline, the one that took most from the fan band alone: each
 * band's level just before the change against the median of its trips since (a windowed level lags).
 * `f`, `r`: the bands' references.
 */
export function fanStep(
  fan: BandMonitor,
  ram: BandMonitor,
  f: number | null,
  r: number | null,
  min_trips: number,
): FanStep | null {
  if (f === null || r === null) return null;
  let best: FanStep | null = null;
  for (const c of fan.periodChanges()) {
    const fanSince = fan.healthSince(c.since_ms, min_trips);
    if (c.level_before === null || fanSince === null) continue;
    const before = ram.levelBefore(c.since_ms);
    const since = ram.healthSince(c.since_ms, min_trips);
    const step: FanStep = {
      since_ms: c.since_ms,
      fall: (c.level_before - fanSince) / f,
      ram_fall: before === null || since === null ? null : (before - since) / r,
    };
    const lead = (x: FanStep) => x.fall - FAN_OVER_RAM * Math.max(0, x.ram_fall ?? Number.POSITIVE_INFINITY);
    if (best === null || lead(step) > lead(best)) best = step;
  }
  return best;
}
