import { InputError, type RejectedSummary } from '@thermargin/shared';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import { loadFleetFile } from '@thermargin/usecases/fleet-file';
import { readCsvFile } from '../import/csv-reader.ts';
import { listCsvFiles } from '../import/data-files.ts';
import { progressReporter } from '../import/progress.ts';
import { VehicleStream } from '../import/vehicle-stream.ts';

/** bad rows shown with file:line on stderr; the rest are only counted. */
const BAD_ROWS_SHOWN = 10;

export interface AnalyzedData {
  vehicles: VehicleModel[];
  streams: Map<string, VehicleStream>;
  rejected: RejectedSummary;
  rows: number;
}

/** Reads the fleet file and every CSV file at `dataPath`, analysing trips as they complete. */
export async function analyzeData(
  fleetPath: string,
  dataPath: string,
  log: (line: string) => void,
  /** Optional observer per vehicle of each analysed piece of samples and its trips (see VehicleStream). */
  observe?: (v: VehicleModel) => ConstructorParameters<typeof VehicleStream>[1],
  max_line_bytes?: number,
): Promise<AnalyzedData> {
  const vehicles = [...loadFleetFile(fleetPath).models.values()];
  const { files, bytes } = listCsvFiles(dataPath);
  const streams = new Map(vehicles.map((v) => [v.id, new VehicleStream(v, observe?.(v))]));
  const by_reason: Record<string, number> = {};
  const unknown = new Set<string>();
  let shown = 0;
  let rows = 0;
  const reject = (reason: string) => {
    by_reason[reason] = (by_reason[reason] ?? 0) + 1;
  };
  const progress = progressReporter(bytes);
  for (const file of files) {
    readCsvFile(
      file,
      {
        sample(vehicle, values, trip) {
          rows++;
          const s = streams.get(vehicle);
          if (s) s.push(values, trip);
          else {
            reject('unknown_vehicle');
            unknown.add(vehicle);
          }
        },
        bad(where, reason) {
          reject(reason);
          if (shown++ < BAD_ROWS_SHOWN) log(`${where}: row skipped: ${reason}`);
        },
      },
      (n) => progress.bytes(n, rows),
      max_line_bytes,
    );
  }
  progress.end();
  if (shown > BAD_ROWS_SHOWN)
    log(`… ${shown - BAD_ROWS_SHOWN} more bad rows skipped (counted in rejected.by_reason)`);
  if (unknown.size)
    log(`rows of vehicles not in the fleet file were skipped: ${[...unknown].slice(0, 10).join(', ')}`);
  for (const s of streams.values()) {
    s.finish();
    for (const [k, n] of Object.entries(s.rejected)) by_reason[k] = (by_reason[k] ?? 0) + n;
  }
  const total = Object.values(by_reason).reduce((a, b) => a + b, 0);
  if (rows === 0)
    throw new InputError([{ where: dataPath, rule: 'no usable rows in any file' }], 'nothing to analyse');
  return { vehicles, streams, rejected: { total, by_reason }, rows };
}
