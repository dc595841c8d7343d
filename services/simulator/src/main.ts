/**
 * Writes the demo fleet's history as import CSV (or its loggers' candump -l logs of J1939 frames, or a data
 * logger's own export with the mapping that reads it) + fleet.json:
 *   node --import tsx services/simulator/src/main.ts --out DIR [--seed N] [--vehicles N] [--days N] [--end ISO|now] [--faults demo|none] [--format csv|candump|export]
 * Prints what it wrote and the generation speed.
 */
import { parseArgs } from 'node:util';
import { writeCandump } from './candump.ts';
import { writeCsv } from './csv.ts';
import { writeLoggerExport } from './logger-export.ts';
import { createScenario, SCENARIO_DEFAULTS, type ScenarioOptions } from './scenario.ts';

const USAGE =
  'usage: main.ts --out DIR [--seed N] [--vehicles N] [--days N] [--end YYYY-MM-DD[THH:MM:SSZ]|now] [--faults demo|none] [--format csv|candump|export]';

function integer(name: string, text: string | undefined, fallback: number): number {
  if (text === undefined) return fallback;
  const n = Number(text);
  if (!Number.isInteger(n))
    throw new Error(`--${name} must be an integer, got ${JSON.stringify(text)}\n${USAGE}`);
  return n;
}

function endOf(text: string | undefined): number {
  if (text === undefined) return SCENARIO_DEFAULTS.end_ms;
  if (text === 'now') return Date.now();
  const t = Date.parse(/T/.test(text) ? text : `${text}T00:00:00Z`);
  if (!Number.isFinite(t))
    throw new Error(
      `--end must be a date (YYYY-MM-DD or ISO 8601 UTC) or "now", got ${JSON.stringify(text)}`,
    );
  return t;
}

export function main(argv: string[]): void {
  const { values } = parseArgs({
    args: argv,
    options: {
      out: { type: 'string' },
      seed: { type: 'string' },
      vehicles: { type: 'string' },
      days: { type: 'string' },
      end: { type: 'string' },
      faults: { type: 'string' },
      format: { type: 'string' },
    },
  });
  if (!values.out) throw new Error(`--out is required\n${USAGE}`);
  if (values.faults !== undefined && values.faults !== 'demo' && values.faults !== 'none')
    throw new Error(`--faults must be demo or none, got ${JSON.stringify(values.faults)}`);
  const writers = { csv: writeCsv, candump: writeCandump, export: writeLoggerExport };
  const format = (values.format ?? 'csv') as keyof typeof writers;
  if (!Object.hasOwn(writers, format))
    throw new Error(`--format must be csv, candump or export, got ${JSON.stringify(values.format)}`);
  const options: Partial<ScenarioOptions> = {
    seed: integer('seed', values.seed, SCENARIO_DEFAULTS.seed),
    vehicles: integer('vehicles', values.vehicles, SCENARIO_DEFAULTS.vehicles),
    days: integer('days', values.days, SCENARIO_DEFAULTS.days),
    end_ms: endOf(values.end),
    faults: (values.faults as 'demo' | 'none' | undefined) ?? SCENARIO_DEFAULTS.faults,
  };
  const t0 = performance.now();
  const scenario = createScenario(options);
  const r = writers[format](values.out, scenario);
  const s = (performance.now() - t0) / 1000;
  console.log(
    `wrote ${r.samples} samples for ${scenario.fleet.vehicles.length} vehicles to ${values.out} in ${s.toFixed(1)} s (${Math.round(r.samples / s)} samples/s)`,
  );
  for (const f of r.files) console.log(`  ${f}`);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  try {
    main(process.argv.slice(2));
  } catch (e) {
    console.error(e instanceof Error ? e.message : e);
    process.exitCode = 2;
  }
}
