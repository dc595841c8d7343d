import { writeFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { safetyCaution } from '@thermargin/shared';
import { tripsCsv } from '../output/trips-csv.ts';
import { textSummary } from '../output/text-summary.ts';
import { analyzeData } from '../import/analyze-data.ts';
import {
  FLEET_DATA_OPTIONS,
  fleetDataProblems,
  MAP_USAGE,
  MAX_LINE_USAGE,
  maxLineBytes,
} from '../fleet-data-args.ts';
import { buildReport } from '../output/report.ts';
import { UsageError } from '../usage-error.ts';

export const ANALYZE_USAGE = `thermargin analyze --fleet FLEET.json --data PATH [--map MAP.json] [--out FILE] [--format json|csv|text] [--threads N]
  --fleet   fleet file (JSON): the vehicles, their cooling packages and design points
  --data    a data file, or a folder of them: CSV tables (the import format, or a logger's own with
            --map) and candump -l logs of SAE J1939 frames (found by their content)
${MAP_USAGE}
  --out     write the result here instead of to standard output
  --threads threads that read and analyse, each taking whole vehicles (default: the machine's cores
            when the data is 32 MB or more; the result is the same with any number)
  --format  json (default: the full result), csv (one row per trip) or text (one line per vehicle)
${MAX_LINE_USAGE}`;

const FORMATS = ['json', 'csv', 'text'] as const;

export async function analyzeCommand(argv: string[], log: (line: string) => void): Promise<void> {
  const { values } = parseArgs({
    args: argv,
    options: { ...FLEET_DATA_OPTIONS, format: { type: 'string' }, threads: { type: 'string' } },
    strict: true,
  });
  const format = (values.format ?? 'json') as (typeof FORMATS)[number];
  const problems = fleetDataProblems(values);
  const maxLine = maxLineBytes(values, problems);
  if (!FORMATS.includes(format))
    problems.push({ where: '--format', rule: `must be one of ${FORMATS.join(', ')}` });
  const threads = values.threads === undefined ? undefined : Number(values.threads);
  if (threads !== undefined && !(Number.isInteger(threads) && threads >= 1 && threads <= 64))
    problems.push({ where: '--threads', rule: 'must be an integer 1…64' });
  if (problems.length) throw new UsageError(problems);
  const data = await analyzeData(values.fleet!, values.data!, log, undefined, {
    map: values.map,
    threads,
    max_line_bytes: maxLine,
  });
  const report = buildReport(data);
  const caution = safetyCaution(data.vehicles.map((v) => v.powertrain));
  const text =
    format === 'csv'
      ? tripsCsv(report, caution)
      : format === 'text'
        ? textSummary(report, caution)
        : `${JSON.stringify({ safety_caution: caution, ...report }, null, 1)}\n`;
  if (values.out) writeFileSync(values.out, text);
  else process.stdout.write(text);
  log(
    `analysed ${data.rows.toLocaleString('en-US')} rows of ${data.vehicles.length} vehicles; ${report.rejected.total} rejected`,
  );
}
