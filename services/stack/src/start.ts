import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { startEmbeddedBroker, type EmbeddedBroker } from '@thermargin/broker';
import { brokerRefusals } from '@thermargin/ingester/broker-refusals';
import { createIngester, readIngesterConfig } from '@thermargin/ingester';
import { vehicleMapSpecs } from '@thermargin/ingester/vehicle-readings';
import { readApiConfig } from '@thermargin/api/config';
import { serveApi } from '@thermargin/api/start';
import { wireApi } from '@thermargin/api/wiring';
import { createScenario, publishScenario } from '@thermargin/simulator';
import { framesFleet } from '@thermargin/simulator/frames';
import { FAULT_WORDS, faultKind, parseFleetText, type Sample, safetyCaution } from '@thermargin/shared';
import type { Logger } from '@thermargin/shared/log';
import { brokerUsers, INGESTER_USER, loadDemoState } from './demo-state.ts';
import { historyFeed, liveFeed } from './feed.ts';
import { analysisCaughtUp } from './catch-up-report.ts';
import { roughDuration } from './progress-bar.ts';
import { readStackConfig } from './stack-config.ts';
import { ensureWebBuilt } from './web-build.ts';

const ROOT = resolve(import.meta.dirname, '../../..');
const log = (line: string) => process.stderr.write(`${line}\n`);
/**
 * Service logs are JSON lines; warnings, errors and the store's state changes (store_down with its
 * reason — disk full, read-only, locked —, store_up, a refused spool, a sign-in back-off) reach the console.
 */
const serviceLog: Logger = (event, detail) => {
  if (/error|fail|reject|spool|retry|store_down|store_up|unavailable|backoff/i.test(event))
    log(`  ${event} ${JSON.stringify(detail)}`);
};

/**
 * The data folder holds the stores, the spool and the demo's state: one that cannot be written stops
 * the start naming the folder, the reason and what to do (SQLite would only say "unable to open
 * database file").
 */
function requireWritable(dir: string): void {
  const probe = join(dir, `.write-check-${process.pid}`);
  try {
    mkdirSync(dir, { recursive: true });
    writeFileSync(probe, '');
    rmSync(probe);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? '';
    throw new Error(
      `the data folder ${dir} cannot be written: ${FAULT_WORDS[faultKind(code)]} (${code}). It holds the stores, the spool ` +
        `and the demo's state: make it writable for this user (remount it read-write, or chown/chmod it), ` +
        `or set THERMARGIN_DATA_DIR to a writable folder.`,
    );
  }
}

/**
 * `npm start`: the whole stack in one process tree — embedded MQTT broker (unless INGEST_MQTT_URL points
 * elsewhere), the sample store (SQLite under the data folder unless STORE_* says otherwise), the ingester,
 * the analyzer and the API with the dashboard, and the simulated demo fleet: its history back-filled at
 * full speed, then driving live. Ctrl-C stops everything; a second start resumes on the same data.
 */
async function main(): Promise<void> {
  const cfg = readStackConfig();
  const data = resolve(cfg.data_dir);
  requireWritable(data);
  const state = loadDemoState(data, {
    seed: cfg.seed,
    vehicles: cfg.vehicles,
    days: cfg.days,
    history_end_ms: Date.now(),
  });
  const scenario = createScenario({
    seed: state.seed,
    vehicles: state.vehicles,
    days: state.days,
    end_ms: state.history_end_ms,
  });
  const fleetFile = cfg.env.FLEET_FILE || join(data, 'fleet.json');
  if (!cfg.env.FLEET_FILE && !existsSync(fleetFile)) {
    const onFrames = frameVehicles(
      scenario.fleet.vehicles.map((v) => v.id),
      cfg.frames,
    );
    writeFileSync(fleetFile, `${JSON.stringify(framesFleet(scenario.fleet, onFrames), null, 1)}\n`);
  }
  // The fleet file says which loggers send frames (a vehicle whose mapping has a frames section), so a
  // second start keeps the first one's choice.
  const fleet = parseFleetText(readFileSync(fleetFile, 'utf8'), fleetFile);
  const mapSpecs = vehicleMapSpecs(fleet, fleetFile);
  const framesFrom = new Set([...mapSpecs].filter(([, s]) => s.map?.frames).map(([id]) => id));
  const users = brokerUsers(
    data,
    state,
    scenario.fleet.vehicles.map((v) => v.id),
  );

  let broker: EmbeddedBroker | undefined;
  const refusals = brokerRefusals(new Set(scenario.fleet.vehicles.map((v) => v.id)));
  if (!cfg.env.INGEST_MQTT_URL)
    broker = await startEmbeddedBroker({
      users,
      port: cfg.broker_port,
      host: '127.0.0.1',
      onRefused: refusals.onRefused,
    });
  const env: Record<string, string | undefined> = {
    STORE_KIND: 'sqlite',
    STORE_SQLITE_PATH: join(data, 'samples.db'),
    RESULTS_SQLITE_PATH: join(data, 'results.db'),
    FLEET_FILE: fleetFile,
    INGEST_FLEET_FILE: fleetFile,
    INGEST_SPOOL_DIR: join(data, 'spool'),
    INGEST_METRICS_PORT: '0',
    API_TOKENS: `demo:admin:${state.api_token}`,
    API_WEB_DIST: join(ROOT, 'web/dist'),
    ...(broker
      ? {
          INGEST_MQTT_URL: broker.url,
          INGEST_MQTT_USERNAME: INGESTER_USER,
          INGEST_MQTT_PASSWORD: state.ingester_password,
          INGEST_MQTT_PROTOCOL: '4',
          INGEST_SHARE_GROUP: '',
          INGEST_CONNECTIONS: '1',
          INGEST_MQTT_CLIENT_ID: 'thermargin-ingester',
        }
      : {}),
    ...cfg.env,
  };

  ensureWebBuilt(ROOT, log);
  const ingestCfg = readIngesterConfig(env);
  const apiCfg = readApiConfig(env);
  // The API's pieces, built as `startApi` builds them; the ingester writes to the same sample store.
  const pieces = await wireApi(apiCfg, { clock: Date.now, log: serviceLog });
  const store = pieces.samples;
  refusals.writeTo(store);
  const known = new Set(scenario.fleet.vehicles.map((v) => v.id));
  const ingester = createIngester(ingestCfg, {
    store,
    known_vehicles: known,
    vehicle_maps: mapSpecs,
    log: serviceLog,
  });
  await ingester.start();
  const api = await serveApi(pieces, apiCfg, { clock: Date.now, log: serviceLog });

  const stop = new AbortController();
  let feeding: Promise<void> = Promise.resolve();
  let stopping: Promise<void> | undefined;
  const shutdown = () =>
    (stopping ??= (async () => {
      log('\nstopping …');
      stop.abort();
      await feeding.catch(() => {});
      await ingester.stop();
      await refusals.close();
      await api.close();
      await broker?.close();
      log('stopped; data kept in ' + data);
    })());
  process.once('SIGINT', shutdown);
  process.once('SIGTERM', shutdown);

  const stored = new Map((await store.listVehicles()).map((s) => [s.vehicle, s.last_ms]));
  const t0 = Date.now();
  /** Announces once the ingester has taken every history sample (stored or rejected), so the figure is honest. */
  const announce = async (history_samples: number) => {
    const m = ingester.metrics;
    while (
      m.samples_received + m.rejected_total + m.samples_incomplete < history_samples &&
      !stop.signal.aborted
    )
      await new Promise((r) => setTimeout(r, 500));
    const samples = (await store.listVehicles()).reduce((n, v) => n + v.count, 0);
    log(
      `\nhistory back-filled in ${roughDuration(Date.now() - t0)}: ${samples.toLocaleString('en-US')} samples stored; the fleet drives on live.`,
    );
    api.analyzer?.poke();
    log(`\ndashboard:  ${api.url}/\nAPI token:  ${state.api_token}   (role admin; sign in with it)\n`);
    log(
      `ingest metrics: http://127.0.0.1:${ingester.metrics_port}/metrics\n\n${safetyCaution(scenario.fleet.vehicles.map((v) => v.powertrain))}\n`,
    );
    if (api.analyzer)
      await analysisCaughtUp(api.analyzer, pieces.results, scenario.history.from_ms, Date.now(), stop.signal);
    log('Ctrl-C stops.');
  };
  const publish = (samples: AsyncIterable<Sample>) =>
    publishScenario(null, scenario, {
      samples,
      url: broker?.url ?? cfg.vehicle_mqtt_url,
      frames: framesFrom,
      credentials: (vehicle) => ({ username: vehicle, password: state.vehicle_passwords[vehicle]! }),
    });
  const simulate = async () => {
    const cut_ms = Date.now();
    let n = 0;
    await publish(historyFeed(scenario, stored, cut_ms, stop.signal, (count) => (n = count)));
    await announce(n);
    await publish(liveFeed(scenario, cut_ms, { speedup: cfg.speedup, now: Date.now, stop: stop.signal }));
  };
  feeding = cfg.simulate ? simulate() : announce(0);
  if (cfg.run_for_s > 0) setTimeout(shutdown, cfg.run_for_s * 1000).unref();
  await feeding.catch((e) => {
    if (!stop.signal.aborted) throw e;
  });
  await (stopping ?? new Promise(() => {}));
}

/** `n` of the demo's vehicles to log frames: every third first (with 10 vehicles: the truck among them). */
function frameVehicles(ids: readonly string[], n: number): Set<string> {
  const order = [...ids.filter((_, i) => i % 3 === 2), ...ids.filter((_, i) => i % 3 !== 2)];
  return new Set(order.slice(0, n));
}

main().catch((e) => {
  log(`thermargin start: ${(e as Error).message}`);
  process.exit(1);
});
