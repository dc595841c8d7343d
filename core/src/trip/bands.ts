import { type AirCondition, FAN_REFERENCE, RAM_REFERENCE } from '../radiator/airside.ts';

/**
 * The two comparable operating bands (docs/operating-bands.md): in each, a vehicle compared with its own history
 * cancels most of the air-flow dependence of k.
 * - ram: steady road speed ≥ 60 km/h with the fan ≤ 20 %: air pushed through by the vehicle's motion;
 * - fan: ≤ 20 km/h with the fan ≥ 80 %: air pulled through by the fan, at idle and in crawling traffic.
 */
export type Band = 'ram' | 'fan';
export const BAND_NAMES: readonly Band[] = ['ram', 'fan'];

export const BANDS = {
  ram: {
    min_speed_kmh: 60,
    max_speed_kmh: Number.POSITIVE_INFINITY,
    min_fan_pct: 0,
    max_fan_pct: 20,
    reference: RAM_REFERENCE,
  },
  fan: { min_speed_kmh: 0, max_speed_kmh: 20, min_fan_pct: 80, max_fan_pct: 100, reference: FAN_REFERENCE },
} as const satisfies Record<Band, { reference: AirCondition } & Record<string, unknown>>;

/** The band a sample's speed and fan duty put it in, or null (the bands do not overlap). */
export function bandOf(speed_kmh: number, fan_pct: number): Band | null {
  if (speed_kmh >= BANDS.ram.min_speed_kmh && fan_pct <= BANDS.ram.max_fan_pct) return 'ram';
  if (speed_kmh <= BANDS.fan.max_speed_kmh && fan_pct >= BANDS.fan.min_fan_pct) return 'fan';
  return null;
}
