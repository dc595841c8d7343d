import type { VehicleModel } from '../vehicle/resolve.ts';
import type { EstimatorOptions } from './estimator-options.ts';

/**
 * Whether each sample finds the thermostat fully open, so the radiator takes the whole loop flow.
 * A loop that regulates at its full-open temperature reads above and below it by the sensor's noise
 * from one sample to the next; judged sample by sample, its windows broke into pieces of seconds and
 * a trip with minutes at full flow got no k. So a hysteresis: once a sample reads full-open, the
 * following ones count until one reads `full_open_hysteresis_k` below it (a Schmitt trigger, the usual
 * cure for a noisy signal at a threshold).
 */
export class FullOpenGate {
  private open: boolean;

  constructor(
    private readonly v: Pick<VehicleModel, 'thermostat_full_open_c'>,
    private readonly o: Pick<EstimatorOptions, 'full_open_hysteresis_k' | 'min_itd_k'>,
    /** Whether the sample before the first was in charge (a window judged on its own starts so). */
    startOpen = false,
  ) {
    this.open = startOpen;
  }

  /** Whether the last sample judged read fully open (what a window starting at the next one starts from). */
  get isOpen(): boolean {
    return this.open;
  }

  /** Whether the radiator is in charge at this sample: fully open (with the hysteresis) and ITD ≥ min_itd_k. */
  inCharge(coolant_in_c: number, itd_k: number): boolean {
    const full = this.v.thermostat_full_open_c;
    this.open = coolant_in_c >= (this.open ? full - this.o.full_open_hysteresis_k : full);
    return this.open && itd_k >= this.o.min_itd_k;
  }
}
