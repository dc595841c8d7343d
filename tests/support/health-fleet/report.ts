/**
 * Prints detection delays and false alarms per scenario, parameter set and seed:
 * `node --import tsx tests/support/health-fleet/report.ts [seeds] [k_noise]` (default 5 seeds, each
 * set's own trip-to-trip noise on k; e.g. 0.01 shows how the delays depend on that noise).
 */
import type { ScenarioParams } from './generate.ts';
import { type RunFigures, run } from './run.ts';
import { PARAMETER_SETS, SCENARIOS, type SetName } from './scenarios.ts';

export function figures(seeds: readonly number[], change: Partial<ScenarioParams> = {}): RunFigures[] {
  const out: RunFigures[] = [];
  for (const set of Object.keys(PARAMETER_SETS) as SetName[]) {
    for (const scenario of SCENARIOS) for (const seed of seeds) out.push(run(set, scenario, seed, change).f);
  }
  return out;
}

export function table(rows: readonly RunFigures[]): string {
  const head = 'set scenario  seed trips delay_trips delay_days false_alarms  detail';
  const line = (r: RunFigures) =>
    `${r.set.padEnd(3)} ${r.scenario.padEnd(9)} ${String(r.seed).padStart(4)} ${String(r.trips).padStart(5)} ${String(r.delay_trips ?? '-').padStart(11)} ${String(r.delay_days ?? '-').padStart(10)} ${String(r.false_alarms).padStart(12)}  ${r.detail}`;
  return [head, ...rows.map(line)].join('\n');
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const n = Number(process.argv[2] ?? 5);
  const noise = process.argv[3];
  console.log(
    table(
      figures(
        Array.from({ length: n }, (_, i) => i + 1),
        noise ? { k_noise: Number(noise) } : {},
      ),
    ),
  );
}
