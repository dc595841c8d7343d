import { describe, expect, it } from 'vitest';
import { thermostatHint } from '../../../core/src/trip/thermostat-hint.ts';
import { HOT_TRIPS, hotMixedTrip } from '../../support/forward-model/trips.ts';
import { FUEL_CELL_BUS } from '../../support/forward-model/vehicles.ts';
import { recover } from '../recovery/harness.ts';

describe('a thermostat figure the loop never reaches', () => {
  it('a loop held within a few kelvin below full open: the hint gives where and suggests the value', () => {
    const held = Array.from({ length: 120 }, (_, i) => 86 + (i % 30) / 10);
    const hint = thermostatHint(held, 95)!;
    expect(hint).toMatch(/held at 87\.5 °C/);
    expect(hint).toMatch(/thermostat_full_open_c ≈ 89/);
  });
  it('no hint for a loop that wandered, or for too few samples', () => {
    expect(
      thermostatHint(
        Array.from({ length: 200 }, (_, i) => 70 + (i % 20)),
        95,
      ),
    ).toBeNull();
    expect(thermostatHint([86, 87, 88], 95)).toBeNull();
  });
  it('forward model: the fleet file puts full open above where the fan holds the bus; the fan band says so', () => {
    const scenario = { vehicle: FUEL_CELL_BUS, profile: hotMixedTrip(HOT_TRIPS['fc-bus-01']!), seed: 3 };
    expect(recover(scenario).fan.estimated_w_m2k).not.toBeNull();
    // The same trip with the fleet file claiming full open at 78 °C, above the fan's 75 °C.
    const wrong = recover(scenario, { thermostat_full_open_c: 78 });
    expect(wrong.fan.estimated_w_m2k).toBeNull();
    expect(wrong.fan.reason).toMatch(
      /never reached with the thermostat fully open \(coolant_in ≥ 78\.0 °C\)/,
    );
    const suggested = Number(/thermostat_full_open_c ≈ (\d+)/.exec(wrong.fan.reason!)?.[1]);
    expect(suggested).toBeGreaterThanOrEqual(FUEL_CELL_BUS.fan.on_c);
    expect(suggested).toBeLessThanOrEqual(FUEL_CELL_BUS.fan.full_c + 1);
  });
});
