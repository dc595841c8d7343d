import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import type { CsvWriteResult } from './csv.ts';
import { candumpLine, DEMO_FRAME_MAPS, framesFleet, sendsEngineFrames, vehicleFrames } from './frames.ts';
import type { Scenario, TimeRange } from './scenario.ts';

/** Lines buffered before each write. */
const LINES_PER_WRITE = 50_000;

/**
 * Writes the scenario as its loggers would have logged the bus: `<dir>/<vehicle>.log` in Linux
 * `candump -l` format (SAE J1939 frames, see frames.ts) for the range (default: the history), the two
 * mapping files of the demo's loggers (`map-electric.json`, `map-engine.json`) and `<dir>/fleet.json`
 * naming each vehicle's (`data_map`) and the trucks' reference torque.
 */
export function writeCandump(dir: string, scenario: Scenario, range?: TimeRange): CsvWriteResult {
  mkdirSync(dir, { recursive: true });
  const files: string[] = [];
  let samples = 0;
  const inline = framesFleet(scenario.fleet);
  const fleet = {
    ...inline,
    vehicles: inline.vehicles.map((v) => ({
      ...v,
      data_map: v.data_map === DEMO_FRAME_MAPS.engine ? 'map-engine.json' : 'map-electric.json',
    })),
  };
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
  for (const [name, data] of [
    ['map-electric.json', DEMO_FRAME_MAPS.electric],
    ['map-engine.json', DEMO_FRAME_MAPS.engine],
    ['fleet.json', fleet],
  ] as const) {
    writeFileSync(join(dir, name), `${JSON.stringify(data, null, 2)}\n`);
    files.push(join(dir, name));
  }
  return { files, samples };
}
