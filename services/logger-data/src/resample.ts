import { NUMERIC_COLUMNS } from '@thermargin/shared';
import type { DecoderConfig } from './j1939/config.ts';
import { STANDARD_CHANNELS } from './j1939/parameters.ts';

/** Receives each built sample: values in NUMERIC_COLUMNS order (time_ms first, NaN when missing). */
export type SampleSink = (values: Float64Array) => void;

const ENGINE_RPM = STANDARD_CHANNELS.indexOf('engine_rpm');
const TORQUE_PCT = STANDARD_CHANNELS.indexOf('torque_pct');
const REFERENCE_TORQUE = STANDARD_CHANNELS.indexOf('reference_torque_nm');

/**
 * Builds samples at a fixed interval from parameters that arrive at their own rates (J1939 sends engine
 * speed every 10–50 ms, temperatures every second): the sample at grid time g (a whole multiple of the
 * interval since the epoch) holds, per signal, the last value received at or before g, unless that value
 * is older than the signal's staleness limit (then it is missing). A value received as "not available"
 * or "error" makes the signal missing from then on. Grid points are made only while the bus is live — a
 * frame within one interval before them — from the first frame's time rounded up to the last frame's
 * rounded up: when the logger falls silent (the vehicle is off) the samples stop, and gaps stay gaps.
 */
export class Resampler {
  private readonly value: Float64Array;
  private readonly time: Float64Array;
  private readonly stale: Float64Array;
  private readonly out = new Float64Array(NUMERIC_COLUMNS.length);
  private readonly column: Int8Array;
  private next = Number.NaN;
  /** µs: the latest frame seen. */
  private latest = Number.NaN;
  samples = 0;

  constructor(
    private readonly config: DecoderConfig,
    private readonly sink: SampleSink,
  ) {
    const n = config.channels.length;
    this.value = new Float64Array(n).fill(Number.NaN);
    this.time = new Float64Array(n).fill(Number.NEGATIVE_INFINITY);
    this.stale = Float64Array.from(config.channels, (c) => c.stale_us);
    this.column = Int8Array.from(config.signals, (s) => NUMERIC_COLUMNS.indexOf(s.signal));
  }

  /** Emits the grid points before `t_us`; call with each frame's time before applying the frame. */
  advance(t_us: number): void {
    const d = this.config.interval_us;
    if (Number.isNaN(this.next)) this.next = Math.ceil(t_us / d) * d;
    while (this.next < t_us) {
      if (this.next - this.latest > d) {
        // The bus fell silent before this point: no samples until the frame at t_us.
        this.next = Math.ceil(t_us / d) * d;
        break;
      }
      this.emit(this.next);
      this.next += d;
    }
    this.latest = t_us;
  }

  set(channel: number, t_us: number, v: number): void {
    this.value[channel] = v;
    this.time[channel] = t_us;
  }

  /** Emits the grid points up to the last frame's time rounded up to the grid. */
  finish(): void {
    if (Number.isNaN(this.latest)) return;
    const d = this.config.interval_us;
    const end = Math.ceil(this.latest / d) * d;
    while (this.next <= end) {
      this.emit(this.next);
      this.next += d;
    }
  }

  private fresh(c: number, g: number): number {
    return g - this.time[c]! <= this.stale[c]! ? this.value[c]! : Number.NaN;
  }

  private emit(g: number): void {
    const out = this.out;
    out.fill(Number.NaN);
    out[0] = g / 1000;
    let any = false;
    const signals = this.config.signals;
    for (let k = 0; k < signals.length; k++) {
      const s = signals[k]!;
      let v = Number.NaN;
      for (let j = 0; j < s.channels.length && Number.isNaN(v); j++) v = this.fresh(s.channels[j]!, g);
      if (s.engine_power && Number.isNaN(v)) v = this.enginePower_kw(g);
      if (!Number.isNaN(v)) {
        out[this.column[k]!] = v;
        any = true;
      }
    }
    if (!any) return;
    this.samples++;
    this.sink(out);
  }

  /**
   * kW: shaft power from engine speed (SPN 190), actual engine percent torque (SPN 513, of the reference
   * torque, negative while the engine brakes) and the engine reference torque (SPN 544):
   * P = T_ref · (torque % / 100) · 2π · n / 60 (J1939-71 defines SPN 513 as a share of SPN 544).
   */
  private enginePower_kw(g: number): number {
    const rpm = this.fresh(ENGINE_RPM, g);
    const pct = this.fresh(TORQUE_PCT, g);
    const bus = this.value[REFERENCE_TORQUE]!;
    const ref = Number.isNaN(bus) ? (this.config.reference_torque_nm ?? Number.NaN) : bus;
    return (((ref * pct) / 100) * rpm * Math.PI) / 30 / 1000;
  }
}
