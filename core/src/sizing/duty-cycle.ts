import { LogHistogram } from './log-histogram.ts';
import { roundTo } from '../stats/round.ts';

/** One operating band of the duty cycle (lower edge inclusive; null = open). */
export interface BandSpan {
  label: string;
  from: number | null;
  to: number | null;
}

/** Bands from ascending edges: below the first, between each pair, from the last up. */
export function bandSpans(edges: readonly number[], unit: string, lowest: number | null): BandSpan[] {
  const out: BandSpan[] = [];
  const first = edges[0];
  if (first === undefined) return [{ label: 'all', from: lowest, to: null }];
  out.push({
    label: lowest === null ? `< ${first} ${unit}` : `${lowest}–${first} ${unit}`,
    from: lowest,
    to: first,
  });
  for (let i = 1; i < edges.length; i++)
    out.push({ label: `${edges[i - 1]}–${edges[i]} ${unit}`, from: edges[i - 1]!, to: edges[i]! });
  out.push({ label: `≥ ${edges.at(-1)} ${unit}`, from: edges.at(-1)!, to: null });
  return out;
}

/** Index of the band holding x (edges ascending; x below the first edge → 0). */
export function bandIndex(edges: readonly number[], x: number): number {
  let i = 0;
  while (i < edges.length && x >= edges[i]!) i++;
  return i;
}

/** Heat-load percentiles and time of one band or of everything. */
export interface HeatDistribution {
  label: string;
  from: number | null;
  to: number | null;
  hours: number;
  /** kW by percentile key `p50`, `p95`…; null when the band saw no time. */
  heat_kw: Record<string, number> | null;
  heat_kw_max: number | null;
}

export interface TimeAbove {
  /** –: the level as a share of the design heat. */
  share_of_design: number;
  /** kW: the level; null for a group whose vehicles' design heats differ. */
  heat_kw: number | null;
  hours: number;
  share_of_time: number;
}

export interface DutyCycle {
  overall: HeatDistribution;
  by_speed: HeatDistribution[];
  by_ambient: HeatDistribution[];
  time_above: TimeAbove[];
}

const r3 = (x: number) => roundTo(x, 3);

/** `p95` for 0.95, `p99.9` for 0.999. */
export function percentileKey(p: number): string {
  return `p${+(p * 100).toFixed(4)}`;
}

export function distribution(
  h: LogHistogram,
  span: BandSpan,
  percentiles: readonly number[],
): HeatDistribution {
  const empty = h.total <= 0;
  const heat: Record<string, number> = {};
  if (!empty) for (const p of percentiles) heat[percentileKey(p)] = r3(h.quantile(p)!);
  return {
    label: span.label,
    from: span.from,
    to: span.to,
    hours: r3(h.total / 3600),
    heat_kw: empty ? null : heat,
    heat_kw_max: empty ? null : r3(h.max),
  };
}

/**
 * Heat generated into the coolant, time-weighted (seconds), overall and split by speed band and by
 * ambient band: the duty cycle. Fixed memory per vehicle; merges across vehicles.
 */
export class DutyHistograms {
  readonly all = new LogHistogram();
  readonly bySpeed: LogHistogram[];
  readonly byAmbient: LogHistogram[];

  constructor(
    readonly speedEdges_kmh: readonly number[],
    readonly ambientEdges_c: readonly number[],
  ) {
    this.bySpeed = Array.from({ length: speedEdges_kmh.length + 1 }, () => new LogHistogram());
    this.byAmbient = Array.from({ length: ambientEdges_c.length + 1 }, () => new LogHistogram());
  }

  add(heat_kw: number, speed_kmh: number, ambient_c: number, dt_s: number): void {
    this.all.add(heat_kw, dt_s);
    this.bySpeed[bandIndex(this.speedEdges_kmh, speed_kmh)]!.add(heat_kw, dt_s);
    this.byAmbient[bandIndex(this.ambientEdges_c, ambient_c)]!.add(heat_kw, dt_s);
  }

  merge(o: DutyHistograms): void {
    this.all.merge(o.all);
    this.bySpeed.forEach((h, i) => {
      h.merge(o.bySpeed[i]!);
    });
    this.byAmbient.forEach((h, i) => {
      h.merge(o.byAmbient[i]!);
    });
  }

  /** Percentiles by band; `timeAbove` is worked out by the caller (it depends on each vehicle's design heat). */
  summary(percentiles: readonly number[], time_above: TimeAbove[]): DutyCycle {
    const speeds = bandSpans(this.speedEdges_kmh, 'km/h', 0);
    const ambients = bandSpans(this.ambientEdges_c, '°C', null);
    return {
      overall: distribution(this.all, { label: 'all', from: null, to: null }, percentiles),
      by_speed: this.bySpeed.map((h, i) => distribution(h, speeds[i]!, percentiles)),
      by_ambient: this.byAmbient.map((h, i) => distribution(h, ambients[i]!, percentiles)),
      time_above,
    };
  }
}
