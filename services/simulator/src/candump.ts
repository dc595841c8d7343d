import { type CsvWriteResult, writePerVehicle } from './csv.ts';
import { candumpLine, DEMO_FRAME_MAPS, framesFleet, sendsEngineFrames, vehicleFrames } from './frames.ts';
import type { Scenario, TimeRange } from './scenario.ts';

/**
 * Writes the scenario as its loggers would have logged the bus: `<dir>/<vehicle>.log` in Linux
 * `candump -l` format (SAE J1939 frames, see frames.ts) for the range (default: the history), the two
 * mapping files of the demo's loggers (`map-electric.json`, `map-engine.json`) and `<dir>/fleet.json`
 * naming each vehicle's (`data_map`) and the trucks' reference torque.
 */
export function writeCandump(dir: string, scenario: Scenario, range?: TimeRange): CsvWriteResult {
  const inline = framesFleet(scenario.fleet);
  const fleet = {
    ...inline,
    vehicles: inline.vehicles.map((v) => ({
      ...v,
      data_map: v.data_map === DEMO_FRAME_MAPS.engine ? 'map-engine.json' : 'map-electric.json',
    })),
  };
  return writePerVehicle(dir, scenario, range, {
    ext: 'log',
    *lines(v, samples) {
      for (const f of vehicleFrames(samples, sendsEngineFrames(v))) yield candumpLine(f);
    },
    json: [
      ['map-electric.json', DEMO_FRAME_MAPS.electric],
      ['map-engine.json', DEMO_FRAME_MAPS.engine],
      ['fleet.json', fleet],
    ],
  });
}
