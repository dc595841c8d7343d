/**
 * Time-weighted histogram on log-spaced bins of constant relative width (the idea of HDR histograms):
 * memory is fixed whatever the number of samples, histograms of different vehicles merge by adding, and
 * a quantile read from it is within half a bin (±0.5 % at the default 1 % bins) of the exact value.
 * Values below `floor` (e.g. heat while regenerating or stopped) count in a zero bin at 0.
 * Example: 0.1 kW floor, 1 % bins, 5000 kW ceiling → 1088 bins.
 */
export interface LogBins {
  /** Smallest value with a bin of its own; below it counts as 0. */
  floor: number;
  /** Largest value resolved; above it counts in the last bin (the maximum is kept exactly). */
  ceiling: number;
  /** –: relative bin width, bins at floor·(1 + ratio)^j. */
  ratio: number;
}

/** kW: heat bins from 0.1 kW to 5 MW at 1 % resolution, common to every vehicle so histograms merge. */
export const HEAT_BINS: Readonly<LogBins> = Object.freeze({ floor: 0.1, ceiling: 5000, ratio: 0.01 });

export class LogHistogram {
  /** Weight per bin; index 0 is the zero bin, index j ≥ 1 covers [floor·r^(j−1), floor·r^j). */
  readonly weights: Float64Array;
  total = 0;
  max = Number.NEGATIVE_INFINITY;
  private readonly lnR: number;

  constructor(readonly bins: Readonly<LogBins> = HEAT_BINS) {
    if (!(bins.floor > 0 && bins.ceiling > bins.floor && bins.ratio > 0))
      throw new RangeError('LogHistogram: needs 0 < floor < ceiling and ratio > 0');
    this.lnR = Math.log1p(bins.ratio);
    this.weights = new Float64Array(2 + Math.ceil(Math.log(bins.ceiling / bins.floor) / this.lnR));
  }

  private index(x: number): number {
    if (x < this.bins.floor) return 0;
    return Math.min(this.weights.length - 1, 1 + Math.floor(Math.log(x / this.bins.floor) / this.lnR));
  }

  /** Lower edge of bin j ≥ 1. */
  private edge(j: number): number {
    return this.bins.floor * Math.exp((j - 1) * this.lnR);
  }

  /** Adds `weight` (e.g. seconds) at value `x`; NaN values and weights ≤ 0 are ignored. */
  add(x: number, weight: number): void {
    if (!(weight > 0) || Number.isNaN(x)) return;
    this.weights[this.index(x)]! += weight;
    this.total += weight;
    if (x > this.max) this.max = x;
  }

  merge(other: LogHistogram): void {
    if (other.weights.length !== this.weights.length || other.bins.floor !== this.bins.floor)
      throw new RangeError('LogHistogram.merge: bins differ');
    for (let j = 0; j < this.weights.length; j++) this.weights[j]! += other.weights[j]!;
    this.total += other.total;
    if (other.max > this.max) this.max = other.max;
  }

  /**
   * Weighted p-quantile, interpolated geometrically within its bin; null when empty. The zero bin reads
   * 0, and the answer never exceeds the largest value seen.
   */
  quantile(p: number): number | null {
    if (!(p >= 0 && p <= 1)) throw new RangeError(`LogHistogram.quantile: p must be within 0…1, got ${p}`);
    if (this.total <= 0) return null;
    const target = p * this.total;
    let cum = 0;
    for (let j = 0; j < this.weights.length; j++) {
      const w = this.weights[j]!;
      if (w > 0 && cum + w >= target) {
        if (j === 0) return 0;
        const f = (target - cum) / w;
        return Math.min(this.max, this.edge(j) * Math.exp(f * this.lnR));
      }
      cum += w;
    }
    return this.max;
  }

  /** Weight at values above `x`, the bin holding x split geometrically. */
  weightAbove(x: number): number {
    const i = this.index(x);
    let above = 0;
    for (let j = i + 1; j < this.weights.length; j++) above += this.weights[j]!;
    const w = this.weights[i]!;
    if (i === 0 || w === 0) return above + (i === 0 && x < 0 ? w : 0);
    const f = Math.min(1, Math.max(0, Math.log(x / this.edge(i)) / this.lnR));
    return above + w * (1 - f);
  }
}
