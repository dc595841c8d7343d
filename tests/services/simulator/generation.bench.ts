/**
 * Benchmark and sanity print of the demo scenario: generation speed (samples/s) and, per vehicle, what
 * the core's trip analysis makes of the history (k per band over time, margin). Prints figures; asserts
 * nothing. Run: node --import tsx tests/services/simulator/generation.bench.ts [days] [vehicles]
 */
import { ESTIMATOR_DEFAULTS } from '@thermargin/core/trip/estimator-options';
import { analyzeTrip } from '@thermargin/core/trip/analyze-trip';
import { splitTrips } from '@thermargin/core/trip/split';
import { resolveVehicle } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type Sample } from '@thermargin/shared';
import { createScenario } from '../../../services/simulator/src/index.ts';

const days = Number(process.argv[2] ?? 28);
const vehicles = Number(process.argv[3] ?? 10);
const sc = createScenario({ days, vehicles });

let n = 0;
const t0 = performance.now();
for (const _ of sc.fleetSamples()) n++;
const s = (performance.now() - t0) / 1000;
console.log(
  `fleet: ${vehicles} vehicles, ${days} days: ${n} samples in ${s.toFixed(1)} s = ${Math.round(n / s)} samples/s (merged)`,
);

const fmt = (x: number | null | undefined, d = 0) =>
  x === null || x === undefined ? '   –' : x.toFixed(d).padStart(5);
for (const cfg of sc.fleet.vehicles) {
  const model = resolveVehicle(cfg);
  const samples: Sample[] = [...sc.vehicleSamples(cfg.id)];
  const c = columnsFromSamples(samples);
  const spans = splitTrips(c);
  let prevEnd: number | null = null;
  const rows: string[] = [];
  let ramTrips = 0;
  let fanTrips = 0;
  for (const span of spans) {
    const r = analyzeTrip(
      c,
      span,
      model,
      { ...ESTIMATOR_DEFAULTS },
      { previousEnd_ms: prevEnd, rejected: {} },
    );
    prevEnd = c.time_ms[span.to - 1]!;
    if (r.k_ram_w_m2k !== null) ramTrips++;
    if (r.k_fan_w_m2k !== null) fanTrips++;
    rows.push(
      `${r.start.slice(5, 16)} ram ${fmt(r.k_ram_w_m2k)} (${String(r.n_ram).padStart(3)}) fan ${fmt(r.k_fan_w_m2k)} (${String(r.n_fan).padStart(3)}) margin ${fmt(r.margin_pct)} soak ${fmt(r.soak_offset_k, 1)} Tmax ${fmt(r.coolant_max_c)} amax ${fmt(r.ambient_max_c)} derate ${r.derate_s}`,
    );
  }
  console.log(
    `\n${cfg.id} ${cfg.type}: ${samples.length} samples, ${spans.length} trips, ram k on ${ramTrips}, fan k on ${fanTrips}; bench ${JSON.stringify(cfg.bench_k_w_m2k ?? null)}`,
  );
  if (process.env.VERBOSE) for (const r of rows) console.log('  ' + r);
  else
    for (const r of rows.filter((_, i) => i % Math.max(1, Math.floor(rows.length / 8)) === 0))
      console.log('  ' + r);
}
