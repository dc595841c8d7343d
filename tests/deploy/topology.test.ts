import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyzeVehicle } from '@thermargin/core/analyze';
import { resolveFleet } from '@thermargin/core/vehicle/resolve';
import { columnsFromSamples, type FleetResponse, type Sample } from '@thermargin/shared';
import { createScenario, publishScenario } from '@thermargin/simulator';
import pg from 'pg';
import { describe, expect, it } from 'vitest';
import { waitFor } from '../support/servers/free-port.ts';
import { startTopology, TOPOLOGY_TOKEN } from '../support/topology.ts';

/**
 * docker-compose.yml's services, started as processes with the compose file's own commands and
 * environments on real Mosquitto, InfluxDB and PostgreSQL: a fleet published as its vehicles goes
 * through both ingesters (shared subscription), both analyzers (leases) and reaches the API.
 */
describe('the compose topology as processes', () => {
  it('carries a published fleet from the broker to the API', async () => {
    const scenario = createScenario({ vehicles: 4, days: 2, seed: 21, end_ms: Date.now() - 3_600_000 });
    const ids = scenario.fleet.vehicles.map((v) => v.id);
    const models = new Map(resolveFleet(scenario.fleet).map((m) => [m.id, m]));
    const fleetFile = join(mkdtempSync(join(tmpdir(), 'thermargin-topology-fleet-')), 'fleet.json');
    writeFileSync(fleetFile, JSON.stringify(scenario.fleet));
    const t = await startTopology({ fleetFile, vehicles: ids, env: { ANALYZER_POLL_MS: '1000' } });
    try {
      await publishScenario(null, scenario, {
        url: t.mosquitto.url,
        credentials: (vehicle) => ({ username: vehicle, password: t.password(vehicle) }),
      });
      const want = new Map(
        ids.map((id) => {
          const samples: Sample[] = [...scenario.vehicleSamples(id)];
          return [id, analyzeVehicle(models.get(id)!, columnsFromSamples(samples)).trips.length];
        }),
      );
      const get = async <T>(path: string) =>
        (await (
          await fetch(`${t.apiUrl}${path}`, { headers: { authorization: `Bearer ${TOPOLOGY_TOKEN}` } })
        ).json()) as T;
      await waitFor(
        'every vehicle analysed through the topology',
        async () => {
          const fleet = await get<FleetResponse>('/api/fleet');
          return fleet.vehicles.every((v) => v.trips === want.get(v.id));
        },
        540_000,
      );
      // Both ingesters took messages from the shared subscription.
      for (const name of ['ingester-1', 'ingester-2']) {
        const metrics = await (await fetch(t.health.get(name)!)).text();
        const stored = Number(/samples_stored_total\S* (\d+)/.exec(metrics)?.[1]);
        expect(stored, name).toBeGreaterThan(0);
      }
      const c = new pg.Client({ connectionString: t.resultsUrl });
      await c.connect();
      const holders = (await c.query('SELECT DISTINCT holder FROM analysis_log ORDER BY holder')).rows.map(
        (r) => r.holder,
      );
      await c.end();
      expect(holders.length).toBeGreaterThanOrEqual(1);
    } finally {
      await t.stop();
    }
  }, 900_000);
});
