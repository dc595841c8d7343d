import { readFileSync } from 'node:fs';
import type { Logger } from '@thermargin/shared/log';
import { fleetSchema, parseOrThrow } from '@thermargin/shared';
import { openSampleStore } from '@thermargin/store';
import { readIngesterConfig } from './config.ts';
import { createIngester } from './ingester.ts';
import { vehicleMapSpecs } from './vehicle-readings.ts';

/** `node --import tsx services/ingester/src/main.ts`: configured by env vars (see README.md). */
const log: Logger = (event, detail) =>
  process.stderr.write(`${JSON.stringify({ time: new Date().toISOString(), event, ...detail })}\n`);

const config = readIngesterConfig();
const fleet = parseOrThrow(
  fleetSchema,
  JSON.parse(readFileSync(config.fleet_file, 'utf8')),
  config.fleet_file,
);
const store = openSampleStore(config.store);
const ingester = createIngester(config, {
  store,
  known_vehicles: new Set(fleet.vehicles.map((v) => v.id)),
  vehicle_maps: vehicleMapSpecs(fleet, config.fleet_file),
  log,
});

let stopping = false;
async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  log('shutdown', { signal });
  await ingester.stop();
  await store.close();
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));

await ingester.start();
log('metrics', { port: ingester.metrics_port });
