import type { SizingVehicleSpec } from './generate.ts';

const common = {
  days: 120,
  cleaned_on: [0, 60],
  ambients_c: [15, 22, 28, 33, 37],
  derate_every: 10,
} as const;

/**
 * Five vehicles of two types with known truth: type "city" loses 0.2 %/day of its clean k (6.09 %
 * per month, 6.67 % per 1000 km at 30 km a day), type "line" 0.1 %/day; field ÷ bench 0.85/0.90/0.95
 * and 0.80/0.90. Cleaned on day 60.
 */
export const SIZING_FLEET: SizingVehicleSpec[] = [
  {
    id: 'c-1',
    type: 'city',
    k_ram: 1500,
    k_fan: 1200,
    bench_ratio: 0.85,
    loss_per_day: 0.002,
    seed: 11,
    ...common,
    cleaned_on: [...common.cleaned_on],
    ambients_c: [...common.ambients_c],
  },
  {
    id: 'c-2',
    type: 'city',
    k_ram: 1450,
    k_fan: 1150,
    bench_ratio: 0.9,
    loss_per_day: 0.002,
    seed: 12,
    ...common,
    cleaned_on: [...common.cleaned_on],
    ambients_c: [...common.ambients_c],
  },
  {
    id: 'c-3',
    type: 'city',
    k_ram: 1550,
    k_fan: 1250,
    bench_ratio: 0.95,
    loss_per_day: 0.002,
    seed: 13,
    ...common,
    cleaned_on: [...common.cleaned_on],
    ambients_c: [...common.ambients_c],
  },
  {
    id: 'l-1',
    type: 'line',
    k_ram: 1400,
    k_fan: 1100,
    bench_ratio: 0.8,
    loss_per_day: 0.001,
    seed: 21,
    ...common,
    cleaned_on: [...common.cleaned_on],
    ambients_c: [...common.ambients_c],
  },
  {
    id: 'l-2',
    type: 'line',
    k_ram: 1400,
    k_fan: 1100,
    bench_ratio: 0.9,
    loss_per_day: 0.001,
    seed: 22,
    ...common,
    cleaned_on: [...common.cleaned_on],
    ambients_c: [...common.ambients_c],
  },
];

/** km driven per trip (one a day): 85 km/h for 1200 s and 10 km/h for 600 s. */
export const KM_PER_DAY = (85 * 1200 + 10 * 600) / 3600;
