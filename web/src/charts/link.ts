import type uPlot from 'uplot';

/**
 * Links the x zoom of every chart in a group: a zoom (drag) or reset on one applies to all. The cursor is
 * linked by uPlot's own `cursor.sync` with the same key.
 */
export class ZoomLink {
  private readonly charts = new Set<uPlot>();
  private busy = false;

  constructor(readonly key: string) {}

  add(u: uPlot): () => void {
    this.charts.add(u);
    return () => this.charts.delete(u);
  }

  /** The uPlot hook to install: forwards an x-scale change to the other charts. */
  readonly onScale = (u: uPlot, scale: string): void => {
    if (scale !== 'x' || this.busy) return;
    const { min, max } = u.scales.x!;
    if (min === undefined || max === undefined || min === null || max === null) return;
    this.busy = true;
    try {
      for (const other of this.charts) if (other !== u) other.setScale('x', { min, max });
    } finally {
      this.busy = false;
    }
  };

  /** Whole x range on every chart. */
  reset(): void {
    for (const u of this.charts) {
      const xs = u.data[0];
      if (xs.length) u.setScale('x', { min: xs[0]!, max: xs[xs.length - 1]! });
    }
  }
}
