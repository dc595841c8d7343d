import { createInfluxStore } from '@thermargin/store';
import { afterAll, beforeAll } from 'vitest';
import { type InfluxServer, startInflux } from '../../support/servers/influx.ts';
import { storeContract } from './contract.ts';

let server: InfluxServer;
let n = 0;
beforeAll(async () => {
  server = await startInflux();
});
afterAll(async () => {
  await server?.close();
});

// Debian's InfluxDB 1.6.7, the adapter's 1.x mode; a fresh database per test.
storeContract('influx (1.x API, real influxd 1.6)', async () => {
  const database = `contract_${n++}`;
  await server.createDatabase(database);
  return createInfluxStore({ url: server.url, api: 'v1', database });
});
