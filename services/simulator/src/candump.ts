import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import type { CsvWriteResult } from './csv.ts';
import { candumpLine, framesFleet, sendsEngineFrames, vehicleFrames } from './frames.ts';
import type { Scenario, TimeRange } from './scenario.ts';

/** Lines buffered before each write. */
const LINES_PER_WRITE = 50_000;

/**
 * Writes the scenario as its loggers would have logged the bus: `<dir>/<vehicle>.log` in Linux
 * `candump -l` format (SAE J1939 frames, see frames.ts) for the range (default: the history), and
 * `<dir>/fleet.json` with each vehicle's mapping (`data_map`) and the trucks' reference torque.
 */
export function writeCandump(dir: string, scenario: Scenario, range?: TimeRange): CsvWriteResult {
  mkdirSync(dir, { recursive: true });
  const files: string[] = [];
  let samples = 0;
  const fleet = framesFleet(scenario.fleet);
  for (const v of fleet.vehicles) {
    const path = join(dir, `${v.id}.log`);
    const fd = openSync(path, 'w');
    try {
      let buf: string[] = [];
      const counted = (function* () {
        for (const s of scenario.vehicleSamples(v.id, range)) {
          samples++;
          yield s;
        }
      })();
      for (const f of vehicleFrames(counted, sendsEngineFrames(v))) {
        buf.push(candumpLine(f));
        if (buf.length >= LINES_PER_WRITE) {
          writeSync(fd, `${buf.join('\n')}\n`);
          buf = [];
        }
      }
      if (buf.length) writeSync(fd, `${buf.join('\n')}\n`);
    } finally {
      closeSync(fd);
    }
    files.push(path);
  }
  const fleetPath = join(dir, 'fleet.json');
  writeFileSync(fleetPath, `${JSON.stringify(fleet, null, 2)}\n`);
  files.push(fleetPath);
  return { files, samples };
}
