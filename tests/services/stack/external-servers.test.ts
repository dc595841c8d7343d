import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createScenario } from '@thermargin/simulator';
import { describe, expect, it } from 'vitest';
import { type InfluxServer, startInflux } from '../../support/servers/influx.ts';
import { type MosquittoServer, startMosquitto } from '../../support/servers/mosquitto.ts';
import { analysed, expectDemoFindings, presetState, runStack, SMOKE_DEMO } from './run-stack.ts';

/** The same demo through real Mosquitto (MQTT 5 shared subscription) and InfluxDB 1.x, pointed at by env. */
describe('npm start against external Mosquitto and InfluxDB', () => {
  it('gives the same findings as the embedded defaults', async () => {
    const data = mkdtempSync(join(tmpdir(), 'thermargin-stack-ext-'));
    const scenario = createScenario({ vehicles: 6, days: 12, end_ms: Date.now() });
    const ids = scenario.fleet.vehicles.map((v) => v.id);
    const password = (who: string) => `test-password-${who}`;
    // Documented test credentials: written before the first start, so the broker can know them.
    presetState(data, {
      seed: 1,
      vehicles: 6,
      days: 12,
      history_end_ms: scenario.history.to_ms,
      ingester_password: password('ingester'),
      vehicle_passwords: Object.fromEntries(ids.map((id) => [id, password(id)])),
      api_token: 'test-token-external-0123456789',
    });
    let mosquitto: MosquittoServer | undefined;
    let influx: InfluxServer | undefined;
    try {
      mosquitto = await startMosquitto([
        { username: 'ingester', password: password('ingester'), role: 'ingester' },
        ...ids.map((id) => ({ username: id, password: password(id), role: 'vehicle' as const })),
      ]);
      influx = await startInflux();
      await influx.createDatabase('thermargin');
      const stack = await runStack(
        {
          ...SMOKE_DEMO,
          INGEST_MQTT_URL: mosquitto.ingester_url,
          THERMARGIN_VEHICLE_MQTT_URL: mosquitto.url,
          INGEST_MQTT_USERNAME: 'ingester',
          INGEST_MQTT_PASSWORD: password('ingester'),
          INGEST_CONNECTIONS: '4',
          STORE_KIND: 'influx',
          STORE_INFLUX_API: 'v1',
          STORE_INFLUX_URL: influx.url,
          STORE_INFLUX_DATABASE: 'thermargin',
        },
        data,
      );
      try {
        expectDemoFindings(await analysed(stack));
      } finally {
        expect(await stack.stop(), stack.log().slice(-2000)).toBe(0);
      }
    } finally {
      await mosquitto?.close();
      await influx?.close();
    }
  }, 900_000);
});
