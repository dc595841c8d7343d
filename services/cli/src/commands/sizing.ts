import { writeFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { DESIGN_NOTE, decimalNumber, InputError, type Problem, safetyCaution } from '@thermargin/shared';
import { DEFAULT_DUTY, type SizingInput, sizeFleet } from '@thermargin/core/sizing/fleet-sizing';
import type { Duty } from '@thermargin/core/sizing/drivetrain-compare';
import {
  resolveSizingOptions,
  SIZING_DEFAULTS,
  type SizingOptions,
  type WhatIfScenario,
} from '@thermargin/core/sizing/options';
import { VehicleSamples } from '@thermargin/core/sizing/vehicle-samples';
import { sizingHtml } from '../output/sizing-html.ts';
import { analyzeData, type DataOptions } from '../import/analyze-data.ts';
import { FLEET_DATA_OPTIONS, fleetDataProblems, MAX_LINE_USAGE, maxLineBytes } from '../fleet-data-args.ts';
import { UsageError } from '../usage-error.ts';

export const SIZING_USAGE = `thermargin sizing --fleet FLEET.json (--data PATH | --from-store) [--out RESULT.json] [--html REPORT.html] [options]
  --fleet      fleet file (JSON): the vehicles, their cooling packages and design points
  --data       a data file or a folder of them, as for analyze (CSV tables, candump -l logs)
  --map        mapping file (JSON) for a logger's own names, units and J1939 parameters, as for analyze
  --from-store instead of --data: the analysed trips and their samples from the stores (reads STORE_*,
               RESULTS_*, and FLEET_FILE when --fleet is not given; as the API's /api/sizing)
  --out        write the sizing result (JSON) here instead of to standard output
  --html       also write a self-contained HTML report for a design review
  --what-if R,D  replay with every ambient raised R K and the coolant limit lowered D K (repeatable;
               default ${SIZING_DEFAULTS.what_if.map((s) => `${s.ambient_rise_k},${s.limit_drop_k}`).join(' and ')})
  --cleaning-interval DAYS  planned cleaning interval the fouling allowance is worked out for (default ${SIZING_DEFAULTS.cleaning_interval_days})
  --duty k=v,…  drivetrain comparison duty: mass_kg, cda_m2, crr, speed_kmh, grade_pct, ambient_c
               (default: the fleet's own, read from its data; what the data cannot give from
               ${Object.entries(DEFAULT_DUTY)
                 .map(([k, v]) => `${k}=${v}`)
                 .join(',')})
${MAX_LINE_USAGE}`;

const DUTY_KEYS = ['mass_kg', 'cda_m2', 'crr', 'speed_kmh', 'grade_pct', 'ambient_c'] as const;

function parseWhatIf(text: string, problems: Problem[]): WhatIfScenario | null {
  const m = /^\s*(-?[\d.]+)\s*,\s*(-?[\d.]+)\s*$/.exec(text);
  if (!m) {
    problems.push({ where: `--what-if ${text}`, rule: 'must be RISE,DROP in K, e.g. 5,0' });
    return null;
  }
  return { ambient_rise_k: decimalNumber(m[1]!), limit_drop_k: decimalNumber(m[2]!) };
}

/** The figures given; the others come from the fleet's data (core/src/sizing/fleet-duty.ts). */
function parseDuty(text: string, problems: Problem[]): Partial<Duty> {
  const duty: Partial<Duty> = {};
  for (const part of text.split(',')) {
    const [key, value] = part.split('=').map((s) => s.trim());
    const x = decimalNumber(value ?? '');
    if (!DUTY_KEYS.includes(key as (typeof DUTY_KEYS)[number]) || value === undefined || !Number.isFinite(x))
      problems.push({
        where: `--duty ${part}`,
        rule: `must be key=number with key one of ${DUTY_KEYS.join(', ')}`,
      });
    else duty[key as (typeof DUTY_KEYS)[number]] = x;
  }
  return duty;
}

export async function sizingCommand(argv: string[], log: (line: string) => void): Promise<void> {
  const { values } = parseArgs({
    args: argv,
    options: {
      ...FLEET_DATA_OPTIONS,
      html: { type: 'string' },
      'what-if': { type: 'string', multiple: true },
      'cleaning-interval': { type: 'string' },
      duty: { type: 'string' },
      'from-store': { type: 'boolean' },
    },
    strict: true,
  });
  const fromStore = values['from-store'] === true;
  const problems: Problem[] = !fromStore
    ? fleetDataProblems(values)
    : (['data', 'map'] as const)
        .filter((k) => values[k] !== undefined)
        .map((k) => ({ where: `--${k}`, rule: 'not with --from-store' }));
  const what_if = (values['what-if'] ?? [])
    .map((t) => parseWhatIf(t, problems))
    .filter((s): s is WhatIfScenario => s !== null);
  const interval =
    values['cleaning-interval'] === undefined ? undefined : decimalNumber(values['cleaning-interval']);
  if (interval !== undefined && !(interval > 0))
    problems.push({ where: '--cleaning-interval', rule: 'must be a number of days > 0' });
  const duty = values.duty === undefined ? undefined : parseDuty(values.duty, problems);
  const maxLine = maxLineBytes(values, problems);
  if (problems.length) throw new UsageError(problems);

  let options: ReturnType<typeof resolveSizingOptions>;
  try {
    options = resolveSizingOptions({
      ...(what_if.length ? { what_if } : {}),
      ...(interval !== undefined ? { cleaning_interval_days: interval } : {}),
    });
  } catch (e) {
    throw new InputError([{ where: 'options', rule: (e as Error).message }]);
  }
  const read = fromStore
    ? await readStore(values.fleet, options, duty)
    : await readData(values.fleet!, values.data!, options, duty, log, {
        map: values.map,
        max_line_bytes: maxLine,
      });
  const result = sizeFleet(read.input, options);
  // The caution and the design note travel with the figures, as in the API's answer.
  const caution = safetyCaution(result.vehicles.map((v) => v.powertrain));
  const json = `${JSON.stringify({ safety_caution: caution, design_note: DESIGN_NOTE, ...result }, null, 1)}\n`;
  if (values.out) writeFileSync(values.out, json);
  else process.stdout.write(json);
  if (values.html)
    writeFileSync(
      values.html,
      sizingHtml(result, { fleet: read.fleet, data: read.data, generated: new Date().toISOString() }),
    );
  log(
    `sized ${read.input.vehicles.length} vehicles from ${read.from}, ${result.period.trips} trips` +
      (values.html ? `; report ${values.html}` : ''),
  );
}

interface SizingRead {
  input: SizingInput;
  /** Fleet file and data source, as the report names them; `from`: the log's words. */
  fleet: string;
  data: string;
  from: string;
}

async function readData(
  fleet: string,
  dataPath: string,
  options: SizingOptions,
  duty: Partial<Duty> | undefined,
  log: (line: string) => void,
  dataOptions: DataOptions,
): Promise<SizingRead> {
  const samples = new Map<string, VehicleSamples>();
  const data = await analyzeData(
    fleet,
    dataPath,
    log,
    (v) => {
      let acc: VehicleSamples;
      try {
        acc = new VehicleSamples(v, options);
      } catch (e) {
        throw new InputError([{ where: `--what-if (vehicle ${v.id})`, rule: (e as Error).message }]);
      }
      samples.set(v.id, acc);
      return (cleaned, spans, trips) => acc.add(cleaned, spans, trips);
    },
    dataOptions,
  );
  const trips = new Map(data.vehicles.map((v) => [v.id, data.streams.get(v.id)!.trips]));
  return {
    input: { vehicles: data.vehicles, trips, samples, ...(duty ? { duty } : {}) },
    fleet,
    data: dataPath,
    from: `${data.rows.toLocaleString('en-US')} rows`,
  };
}

async function readStore(
  fleetPath: string | undefined,
  options: SizingOptions,
  duty: Partial<Duty> | undefined,
): Promise<SizingRead> {
  // Loaded here: the stores' modules would slow every `sizing --data` run's start-up.
  const [{ storedDeployment }, { loadFleetFile }, { sizingInputFromConfig }, { describeResults }] =
    await Promise.all([
      import('../stored-deployment.ts'),
      import('@thermargin/usecases/fleet-file'),
      import('@thermargin/usecases/sizing-input'),
      import('@thermargin/store/config'),
    ]);
  const config = storedDeployment('--from-store', process.env, fleetPath);
  const vehicles = [...loadFleetFile(config.fleet_file).models.values()];
  const read = await sizingInputFromConfig(config, vehicles, options, duty).catch((e) => {
    throw e instanceof RangeError ? new InputError([{ where: '--what-if', rule: e.message }]) : e;
  });
  const missing = read.trips_without_samples;
  return {
    input: read.input,
    fleet: config.fleet_file,
    data: `${config.samples.kind} sample store, results ${describeResults(config.results)}`,
    from: `the stores${missing ? ` (${missing} trips without samples: trip figures only)` : ''}`,
  };
}
