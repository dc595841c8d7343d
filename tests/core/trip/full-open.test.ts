import { columnsFromSamples } from '@thermargin/shared';
import { ESTIMATOR_DEFAULTS, type EstimatorOptions } from '@thermargin/core/trip/estimator-options';
import { FullOpenGate } from '@thermargin/core/trip/full-open';
import { tripWindows } from '@thermargin/core/trip/windows';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { describe, expect, it } from 'vitest';
import { fleetConfig } from '../../support/forward-model/fleet-config.ts';
import { VEHICLES } from '../../support/forward-model/vehicles.ts';

const config = { ...fleetConfig(VEHICLES[0]!), thermostat_full_open_c: 88, coolant_sensor_lag_s: 0 };
const model = resolveVehicle(config);

describe('full-open judged with a hysteresis', () => {
  it('counts from the first full-open reading until one reads 0.5 K below', () => {
    const gate = new FullOpenGate(model, ESTIMATOR_DEFAULTS);
    const open = [87.9, 88.1, 87.8, 88.2, 87.6, 87.4, 87.9].map((t) => gate.inCharge(t, 40));
    expect(open).toEqual([false, true, true, true, true, false, false]);
  });

  it('a loop regulating at its full-open temperature keeps its fan-band windows whole', () => {
    // Two standing minutes at full fan, the sensor's noise putting every other reading 0.2 K below.
    const samples = Array.from({ length: 240 }, (_, i) => ({
      vehicle: model.id,
      time_ms: Date.UTC(2026, 6, 1) + i * 1000,
      speed_kmh: 0,
      power_kw: 40,
      coolant_in_c: i % 2 ? 87.8 : 88.2,
      ambient_c: 35,
      fan_pct: 100,
      derate: 0,
    }));
    const c = columnsFromSamples(samples);
    const fan = (o: EstimatorOptions) => tripWindows(c, 0, c.n, model, o).fan;
    expect(fan(ESTIMATOR_DEFAULTS).evidence.itd_k.length).toBe(4);
    const sampleBySample = fan({ ...ESTIMATOR_DEFAULTS, full_open_hysteresis_k: 0 });
    expect(sampleBySample.evidence.itd_k.length).toBe(0);
    expect(sampleBySample.rejected.short).toBeGreaterThan(100);
  });
});
