/**
 * Running sums of a least-squares line y = a + b·x over streamed points (the normal equations of
 * Legendre 1805), for a line's value at one end of a run without storing the run.
 * Example: (0, 1), (1, 3), (2, 5) → slope 2, value at 0 of 1.
 */
export class LineSums {
  n = 0;
  private sx = 0;
  private sxx = 0;
  private sy = 0;
  private sxy = 0;

  add(x: number, y: number): void {
    this.n++;
    this.sx += x;
    this.sxx += x * x;
    this.sy += y;
    this.sxy += x * y;
  }

  /** The slope; 0 when the x values do not spread (one point, or all alike). */
  slope(): number {
    const den = this.n * this.sxx - this.sx * this.sx;
    return den > 0 ? (this.n * this.sxy - this.sx * this.sy) / den : 0;
  }

  /** The line's value at x = 0 (the mean of y when the slope is 0); NaN without points. */
  valueAtZero(): number {
    return (this.sy - this.slope() * this.sx) / this.n;
  }
}
