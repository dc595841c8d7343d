import type { FleetResponse, TraceResponse, VehicleSummary } from '@thermargin/shared/api';
import { TRACE_COLUMNS } from '@thermargin/shared/api';
import type { TripResult } from '@thermargin/shared/results';
import { SAFETY_CAUTION } from '@thermargin/shared/safety';

/** Deterministic 0…1 numbers (a 32-bit LCG): the same fleet every run. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1_664_525) + 1_013_904_223) >>> 0) / 2 ** 32;
}

const NOW_MS = Date.UTC(2026, 7, 1);
const iso = (ms: number) => new Date(ms).toISOString();

/** A fleet answer of `n` vehicles with spread statuses, margins and dates (the dashboard's heaviest list). */
export function syntheticFleet(n: number): FleetResponse {
  const r = lcg(7);
  const vehicles: VehicleSummary[] = Array.from({ length: n }, (_, i) => {
    const margin = 40 - 60 * r();
    const status = margin < 0 ? 'inspect' : margin < 10 ? 'watch' : 'ok';
    return {
      id: `bench-${String(i + 1).padStart(4, '0')}`,
      type: i % 3 ? '12 m battery-electric bus' : '3.5 t battery-electric van',
      powertrain: 'bev',
      status,
      cause: status === 'ok' ? 'none' : (['fouling', 'fan', 'coolant_flow', 'sensor'] as const)[i % 4]!,
      health: { ram: 0.7 + 0.3 * r(), fan: 0.7 + 0.3 * r() },
      margin_pct: margin,
      limiting_ambient_c: 30 + margin / 2,
      route_max_ambient_c: 38,
      margin_basis: 'fan',
      projected_inspect_date: status === 'ok' ? null : iso(NOW_MS + (r() - 0.3) * 30 * 86_400_000),
      last_seen: iso(NOW_MS - r() * 86_400_000),
      last_trip_end: iso(NOW_MS - r() * 86_400_000),
      trend: (['falling', 'steady', 'rising'] as const)[i % 3]!,
      trips: 100 + (i % 50),
      open_alerts: status === 'ok' ? 0 : 1,
    };
  });
  const count = (s: string) => vehicles.filter((v) => v.status === s).length;
  return {
    time: iso(NOW_MS),
    counts: { ok: count('ok'), watch: count('watch'), inspect: count('inspect'), unassessed: 0 },
    vehicles,
    safety_caution: SAFETY_CAUTION,
  };
}

const TRIP: TripResult = {
  trip: 'T1',
  start: iso(NOW_MS - 4 * 3_600_000),
  end: iso(NOW_MS),
  samples: 0,
  rejected: 0,
  distance_km: 120,
  k_ram_w_m2k: 2800,
  k_ram_ci95: [2750, 2850],
  n_ram: 40,
  k_ram_reason: null,
  k_fan_w_m2k: 2850,
  k_fan_ci95: [2800, 2900],
  n_fan: 60,
  k_fan_reason: null,
  heat_kw_mean: 60,
  heat_kw_p95: 140,
  heat_kw_max: 200,
  heat_kwh: 240,
  derate_s: 300,
  coolant_max_c: 88,
  ambient_max_c: 36,
  margin_pct: 12,
  limiting_ambient_c: 44,
  margin_basis: 'fan',
  ambient_mean_c: 31,
  soak_offset_k: null,
  fan_saturated_share: 0.1,
  coolant_dt_per_kw: 0.05,
  sensor_flags: [],
  status: 'ok',
};

/** A trip trace with `points` rows of plausible signals over four hours, with derate and band runs. */
export function syntheticTrace(points: number): TraceResponse {
  const r = lcg(11);
  const t0 = Date.parse(TRIP.start);
  const step = (4 * 3_600_000) / points;
  const cols: Record<(typeof TRACE_COLUMNS)[number], (number | null)[]> = Object.fromEntries(
    TRACE_COLUMNS.map((c) => [c, new Array(points)]),
  ) as never;
  for (let i = 0; i < points; i++) {
    const ph = i / points;
    const speed = Math.max(0, 40 + 30 * Math.sin(ph * 200) + 5 * r());
    const power = 80 * Math.sin(ph * 200 + 0.3) + 20 * r();
    const windowed = Math.floor(ph * 40) % 3 === 0;
    cols.time_ms[i] = Math.round(t0 + i * step);
    cols.speed_kmh[i] = speed;
    cols.power_kw[i] = power;
    cols.coolant_in_c[i] = 80 + 6 * Math.sin(ph * 30) + r();
    cols.coolant_out_c[i] = 74 + 6 * Math.sin(ph * 30) + r();
    cols.ambient_c[i] = 30 + 5 * ph;
    cols.fan_pct[i] = Math.min(100, Math.max(0, 50 + 50 * Math.sin(ph * 60)));
    cols.coolant_flow_lpm[i] = 150;
    cols.derate[i] = Math.floor(ph * 25) % 11 === 5 ? 1 : 0;
    cols.heat_generated_kw[i] = Math.max(0, power * 0.5 + 20);
    cols.heat_rejected_kw[i] = windowed ? Math.max(0, power * 0.5 + 15) : null;
    cols.k_w_m2k[i] = windowed ? 2800 + 50 * Math.sin(ph * 10) : null;
    cols.counted_ram[i] = windowed && speed > 50 ? 1 : 0;
    cols.counted_fan[i] = windowed && speed <= 50 ? 1 : 0;
  }
  return {
    vehicle: 'bench-0001',
    trip: { ...TRIP, samples: points },
    coolant_limit_c: 85,
    samples: points,
    points,
    method: 'lttb',
    columns: [...TRACE_COLUMNS],
    data: TRACE_COLUMNS.map((c) => cols[c]),
  };
}
