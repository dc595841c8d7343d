import { ColumnBuilder, type SampleColumns, type TripResult } from '@thermargin/shared';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { startsTrip, type TripSpan } from '@thermargin/core/trip/split';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';

/**
 * Samples buffered per vehicle before complete trips are analysed and released (≈ 1 h at 1 Hz): a
 * file interleaves many vehicles, each holding its buffer (peak memory against a larger buffer:
 * DEVELOPERS.md, bench figures), and results do not depend on it (pieces are cut at trip starts).
 */
const FLUSH_SAMPLES = 1 << 12;

/**
 * One vehicle's samples as they stream in. While the input arrives in time order, complete trips are
 * analysed every FLUSH_SAMPLES and their samples released, so memory holds one buffer per vehicle plus
 * the trip results. Unordered input is buffered whole and sorted at the end. A sample older than an
 * already analysed trip cannot join it: it is rejected as `late_after_trip_closed`, never dropped silently.
 */
export class VehicleStream {
  private buf = new ColumnBuilder();
  private ordered = true;
  private lastTime = Number.NEGATIVE_INFINITY;
  private closedUpTo_ms = Number.NEGATIVE_INFINITY;
  private previousEnd_ms: number | null = null;
  private nextFlushAt = FLUSH_SAMPLES;
  readonly trips: TripResult[] = [];
  /** Samples pushed, refused or not. */
  received = 0;
  readonly rejected: Record<string, number> = {};
  readonly dropped: Record<string, number> = {};

  /** `onAnalysed` sees each analysed piece (cleaned columns valid only during the call, their trip
   *  spans, and the trips made of them). */
  constructor(
    readonly vehicle: VehicleModel,
    private readonly onAnalysed?: (
      cleaned: SampleColumns,
      spans: readonly TripSpan[],
      trips: readonly TripResult[],
    ) => void,
  ) {}

  push(values: Float64Array, trip: string | undefined): void {
    this.received++;
    const t = values[0]!;
    if (t <= this.closedUpTo_ms) {
      this.rejected.late_after_trip_closed = (this.rejected.late_after_trip_closed ?? 0) + 1;
      return;
    }
    if (t < this.lastTime) this.ordered = false;
    if (t > this.lastTime) this.lastTime = t;
    this.buf.push(values, trip);
    if (this.ordered && this.buf.length >= this.nextFlushAt) this.flushCompleteTrips();
  }

  private analyze(to: number): void {
    if (to === 0) return;
    const piece = this.buf.view(0, to);
    const r = analyzeVehicle(this.vehicle, piece, {}, this.previousEnd_ms);
    this.onAnalysed?.(r.cleaned, r.spans, r.trips);
    this.trips.push(...r.trips);
    for (const [k, n] of Object.entries(r.rejected.by_reason)) this.rejected[k] = (this.rejected[k] ?? 0) + n;
    for (const [k, n] of Object.entries(r.dropped_values)) this.dropped[k] = (this.dropped[k] ?? 0) + n;
    const last = r.trips.at(-1);
    if (last) this.previousEnd_ms = Date.parse(last.end);
  }

  /** Analyses everything before the last trip start, which may still be growing. */
  private flushCompleteTrips(): void {
    const live = this.buf.live;
    let b = this.buf.length - 1;
    while (b > 0 && !startsTrip(live, b)) b--;
    if (b > 0) {
      this.analyze(b);
      this.closedUpTo_ms = live.time_ms[b - 1]!;
      this.buf.dropBefore(b);
    }
    this.nextFlushAt = this.buf.length + FLUSH_SAMPLES;
  }

  finish(): void {
    this.analyze(this.buf.length);
    this.buf = new ColumnBuilder(1);
  }
}
