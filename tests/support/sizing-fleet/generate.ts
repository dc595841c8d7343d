import { DAY_MS } from '@thermargin/shared/time';
import {
  ColumnBuilder,
  NUMERIC_COLUMNS,
  type SampleColumns,
  type VehicleConfigInput,
} from '@thermargin/shared';
import { faceVelocity_ms } from '@thermargin/core/radiator/airside';
import { createRng } from '@thermargin/core/stats/prng';
import { SENSOR_CHECK_DEFAULTS } from '@thermargin/core/trip/sensor-checks';

/**
 * A fleet generator whose true sizing figures are known: one trip a day, a ram-band leg (85 km/h, fan 0)
 * and a fan-band climb (10 km/h, fan 100 %), heat drawn uniformly within ±spread of a set level, the
 * coolant from a lumped loop C·dT/dt = Q − kA·(T − T_amb) with k following the core's air-side model
 * exactly (k_ref·(v/v_ref)^0.5), and k falling linearly with days since the last cleaning. After the
 * night's stop the coolant reads ambient for the first samples (a soaked loop at key-on).
 */
export interface SizingVehicleSpec {
  id: string;
  type: string;
  /** W/(m²·K): clean k at each band's reference condition (80 km/h fan 0; standstill fan 100 %). */
  k_ram: number;
  k_fan: number;
  /** –: clean field k ÷ bench k, the same for both bands. */
  bench_ratio: number;
  /** –: share of the clean k lost per day since the last cleaning. */
  loss_per_day: number;
  /** Day numbers (from 0) on whose morning the radiator is cleaned. */
  cleaned_on: number[];
  days: number;
  /** °C: the day's ambient cycles through these. */
  ambients_c: number[];
  /** Every `derate_every` days (day % derate_every === derate_every / 2) the leg ends with 120 s derated at 70 % power. */
  derate_every: number;
  seed: number;
}

export const LEG = { ram_s: 1200, fan_s: 600, step_s: 2, ram_kmh: 85, fan_kmh: 10, derate_s: 120 } as const;
/** Samples at key-on that read the soaked loop (ambient): all those the soak check's line spans. */
const KEY_ON_SAMPLES = Math.floor(SENSOR_CHECK_DEFAULTS.soak_fit_s / LEG.step_s) + 1;
/** °C: clean-radiator coolant level the heat is set for. */
const TARGET_C = 74;
/** –: heat drawn uniformly within ±20 % of the set level. */
export const HEAT_SPREAD = 0.2;
export const START_MS = Date.UTC(2025, 4, 1, 8);

export const BASE_CONFIG = {
  powertrain: 'bev',
  drivetrain_efficiency: 0.8,
  radiator_area_m2: 1.2,
  coolant_limit_c: 95,
  thermostat_open_c: 60,
  thermal_mass_kj_per_k: 60,
  coolant_glycol_pct: 50,
  design: { ambient_c: 40, heat_kw: 90, speed_kmh: 85, fan_pct: 0 },
} as const satisfies Omit<VehicleConfigInput, 'id'>;
/** –: coolant share of the input, 1 − η (the default for electric drivetrains). */
const SHARE = 1 - BASE_CONFIG.drivetrain_efficiency;

const AIR = { ram_face_ratio: 0.25, fan_face_velocity_ms: 4, velocity_exponent: 0.5 };
const g = (kmh: number, fan: number, refKmh: number, refFan: number) =>
  (faceVelocity_ms(kmh, fan, AIR) / faceVelocity_ms(refKmh, refFan, AIR)) ** AIR.velocity_exponent;
/** Air-side factors of the two legs against their band references. */
export const G_RAM = g(LEG.ram_kmh, 0, 80, 0);
export const G_FAN = g(LEG.fan_kmh, 100, 0, 100);

/** The clean-k heat level of a leg on a day at `ambient_c`: what holds the clean loop at TARGET_C. */
export function legHeat_kw(spec: SizingVehicleSpec, leg: 'ram' | 'fan', ambient_c: number): number {
  const ka = (leg === 'ram' ? spec.k_ram * G_RAM : spec.k_fan * G_FAN) * BASE_CONFIG.radiator_area_m2;
  return (ka * (TARGET_C - ambient_c)) / 1000;
}

export function dayAmbient_c(spec: SizingVehicleSpec, day: number): number {
  return spec.ambients_c[day % spec.ambients_c.length]!;
}

export function isDerateDay(spec: SizingVehicleSpec, day: number): boolean {
  return spec.derate_every > 0 && day % spec.derate_every === Math.floor(spec.derate_every / 2);
}

/** –: k ÷ clean k on `day`. */
export function health(spec: SizingVehicleSpec, day: number): number {
  const last = Math.max(0, ...spec.cleaned_on.filter((d) => d <= day));
  return 1 - spec.loss_per_day * (day - last);
}

export function fleetEntry(spec: SizingVehicleSpec): VehicleConfigInput {
  return {
    id: spec.id,
    type: spec.type,
    ...BASE_CONFIG,
    design: { ...BASE_CONFIG.design },
    bench_k_w_m2k: { ram: spec.k_ram / spec.bench_ratio, fan: spec.k_fan / spec.bench_ratio },
    airside: AIR,
    maintenance: spec.cleaned_on
      .filter((d) => d > 0)
      .map((d) => ({
        date: new Date(START_MS + d * DAY_MS).toISOString().slice(0, 10),
        action: 'radiator_cleaned' as const,
      })),
  };
}

/** The vehicle's samples in time order, and the heat of each sample (kW) for reference statistics. */
export function generateVehicle(spec: SizingVehicleSpec): { columns: SampleColumns; heat_kw: number[] } {
  const rng = createRng(spec.seed);
  const b = new ColumnBuilder(spec.days * ((LEG.ram_s + LEG.fan_s) / LEG.step_s + 1));
  const heat: number[] = [];
  const values = new Float64Array(NUMERIC_COLUMNS.length);
  const C = BASE_CONFIG.thermal_mass_kj_per_k;
  for (let day = 0; day < spec.days; day++) {
    const amb = dayAmbient_c(spec, day);
    const h = health(spec, day);
    const t0 = START_MS + day * DAY_MS;
    const derateDay = isDerateDay(spec, day);
    let T = TARGET_C + (TARGET_C - amb) * (1 / h - 1);
    const n = (LEG.ram_s + LEG.fan_s) / LEG.step_s;
    for (let i = 0; i < n; i++) {
      const s = i * LEG.step_s;
      const ram = s < LEG.ram_s;
      const derated = derateDay && ram && s >= LEG.ram_s - LEG.derate_s;
      const level = legHeat_kw(spec, ram ? 'ram' : 'fan', amb) * (derated ? 0.7 : 1);
      const q = level * (1 + HEAT_SPREAD * (2 * rng.uniform() - 1));
      const ka_kw_k =
        ((ram ? spec.k_ram * G_RAM : spec.k_fan * G_FAN) * h * BASE_CONFIG.radiator_area_m2) / 1000;
      values[0] = t0 + s * 1000;
      values[1] = ram ? LEG.ram_kmh : LEG.fan_kmh;
      values[2] = (q * BASE_CONFIG.drivetrain_efficiency) / SHARE;
      // Key-on after the night's soak: the first samples read the loop at ambient, as a real one would
      // (the soak check of the health assessment); the warm-up itself is left out, so the heat and k
      // truths stay those of the two legs.
      values[3] = i < KEY_ON_SAMPLES ? amb : Math.round(T * 100) / 100;
      values[4] = Number.NaN;
      values[5] = amb;
      values[6] = ram ? 0 : 100;
      values[7] = Number.NaN;
      values[8] = derated ? 1 : 0;
      b.push(values, `d${day}`);
      heat.push(q);
      const Tinf = amb + q / ka_kw_k;
      T = Tinf + (T - Tinf) * Math.exp((-ka_kw_k * LEG.step_s) / C);
    }
  }
  return { columns: b.view(), heat_kw: heat };
}

/** CSV text in the import format. */
export function toCsv(id: string, c: SampleColumns): string {
  const lines = ['time,vehicle,trip,speed_kmh,power_kw,coolant_in_c,ambient_c,fan_pct,derate'];
  for (let i = 0; i < c.n; i++)
    lines.push(
      [
        new Date(c.time_ms[i]!).toISOString(),
        id,
        c.trip[i],
        c.speed_kmh[i],
        +c.power_kw[i]!.toFixed(3),
        c.coolant_in_c[i],
        c.ambient_c[i],
        c.fan_pct[i],
        c.derate[i],
      ].join(','),
    );
  return `${lines.join('\n')}\n`;
}
