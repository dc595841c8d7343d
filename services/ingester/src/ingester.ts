import type { Server } from 'node:http';
import {
  INGEST_TOPIC_FILTERS,
  parseVehicleTopic,
  type RejectReason,
  sharedSampleFilter,
} from '@thermargin/shared';
import type { Logger } from '@thermargin/shared/log';
import type { SampleStore } from '@thermargin/store';
import mqtt, { type IClientOptions, type MqttClient } from 'mqtt';
import { brokerRefusals } from './broker-refusals.ts';
import type { IngesterConfig } from './config.ts';
import { DecodePool } from './decode-pool.ts';
import { type Decoded, safeDecode } from './decode.ts';
import { IngestMetrics, serverPort, startMetricsServer } from './metrics.ts';
import { followMosquittoLog } from './mosquitto-log.ts';
import { PIPELINE_DEFAULTS, Pipeline } from './pipeline.ts';
import { Spool } from './spool.ts';
import { type VehicleMapSpec, vehicleReadings } from './vehicle-readings.ts';

export interface IngesterDeps {
  store: SampleStore;
  /** Vehicle ids of the fleet file: samples of any other vehicle are dead-lettered. */
  known_vehicles: ReadonlySet<string>;
  /** The fleet file's data_map and engine reference torque per vehicle (how its frames and JSON read). */
  vehicle_maps?: ReadonlyMap<string, VehicleMapSpec>;
  /** ms since epoch; injected so tests control the clock checks. */
  clock?: () => number;
  log?: Logger;
}

export interface Ingester {
  readonly metrics: IngestMetrics;
  /** The metrics server's port once started (undefined when disabled). */
  readonly metrics_port: number | undefined;
  /** Connects and subscribes every connection; resolves once all are subscribed. */
  start(): Promise<void>;
  /** Graceful: stops taking messages, writes and acknowledges what is pending, disconnects. */
  stop(): Promise<void>;
}

export const RECONNECT_BACKOFF = {
  /** ms: first reconnect delay, doubled per failed attempt up to the max, with ±25 % jitter. */
  min_ms: 250,
  max_ms: 10_000,
};

/** MQTT messages in flight per connection (MQTT 5 receive maximum): bounds the client's memory. */
export const RECEIVE_MAXIMUM = 8;
/** bytes: the broker drops larger packets for us; set its own message_size_limit lower (see README). */
export const MAXIMUM_PACKET_BYTES = 16 * 1024 * 1024;

/** Ends a connection after its last acknowledgements went out; forced when that takes over 2 s. */
async function endClient(client: MqttClient): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<'late'>((resolve) => (timer = setTimeout(() => resolve('late'), 2000)));
  const outcome = await Promise.race([client.endAsync(false).then(() => 'ended' as const), late]);
  clearTimeout(timer);
  if (outcome === 'late') await client.endAsync(true);
}

export function createIngester(config: IngesterConfig, deps: IngesterDeps): Ingester {
  const clock = deps.clock ?? Date.now;
  const log = deps.log ?? (() => {});
  const metrics = new IngestMetrics();
  const spool = new Spool(config.spool_dir, config.spool_max_bytes);
  const pipeline = new Pipeline(
    deps.store,
    spool,
    metrics,
    { ...PIPELINE_DEFAULTS, batch_samples: config.batch_samples, linger_ms: config.linger_ms },
    () => Math.max(1, metrics.connections_up),
    log,
  );
  const filters = INGEST_TOPIC_FILTERS.map((f) =>
    config.mqtt.share_group ? sharedSampleFilter(config.mqtt.share_group, f) : f,
  );
  // A plain subscription hands every message to every connection: only a shared one can spread the load.
  if (!config.mqtt.share_group && config.mqtt.connections > 1)
    throw new Error(
      `ingester: ${config.mqtt.connections} connections need a shared subscription (INGEST_SHARE_GROUP); without one use INGEST_CONNECTIONS=1`,
    );
  // Its ids are reserved for it: a vehicle logging in with one would replace this session.
  const taken = Array.from(
    { length: config.mqtt.connections },
    (_, i) => `${config.mqtt.client_id}-${i}`,
  ).filter((id) => deps.known_vehicles.has(id));
  if (taken.length)
    throw new Error(
      `ingester: client id ${taken.join(', ')} is a vehicle id of the fleet file; choose another INGEST_MQTT_CLIENT_ID`,
    );
  const decodeContext = {
    known_vehicles: deps.known_vehicles,
    max_payload_bytes: config.max_payload_bytes,
    readings: vehicleReadings(deps.vehicle_maps ?? []),
  };
  const pool =
    config.decode_workers > 0
      ? new DecodePool(config.decode_workers, decodeContext, log, deps.vehicle_maps)
      : undefined;
  /** decodes in flight on the pool: stop() lets them reach the pipeline before its last flush */
  const decodes = new Set<Promise<void>>();
  const clients: MqttClient[] = [];
  let stopping = false;
  let server: Server | undefined;
  let brokerLog:
    | { refusals: ReturnType<typeof brokerRefusals>; follower: ReturnType<typeof followMosquittoLog> }
    | undefined;

  function connectOne(index: number): Promise<void> {
    const m = config.mqtt;
    const options: IClientOptions = {
      clientId: `${m.client_id}-${index}`,
      username: m.username,
      password: m.password,
      protocolVersion: m.protocol,
      clean: false,
      reconnectPeriod: RECONNECT_BACKOFF.min_ms,
      connectTimeout: 10_000,
      keepalive: 30,
      resubscribe: false,
      ...(m.protocol === 5
        ? {
            properties: {
              sessionExpiryInterval: m.session_expiry_s,
              receiveMaximum: RECEIVE_MAXIMUM,
              maximumPacketSize: MAXIMUM_PACKET_BYTES,
            },
          }
        : {}),
    };
    const client = mqtt.connect(m.url, options);
    clients.push(client);
    let backoff = RECONNECT_BACKOFF.min_ms;
    client.on('reconnect', () => {
      metrics.broker_reconnects++;
      backoff = Math.min(backoff * 2, RECONNECT_BACKOFF.max_ms);
      client.options.reconnectPeriod = Math.round(backoff * (0.75 + Math.random() / 2));
    });
    client.on('close', () => {
      metrics.connections_up = clients.filter((c) => c.connected).length;
    });
    client.on('error', (e) => log('mqtt_error', { client: options.clientId, error: e.message }));
    // Taking over the acknowledgement: MQTT.js sends the PUBACK when `done` is called.
    client.handleMessage = (packet, done) => {
      if (stopping) return; // never acknowledged: the broker redelivers it to this session or the group
      const payload = Buffer.isBuffer(packet.payload) ? packet.payload : Buffer.from(packet.payload);
      const parsed = parseVehicleTopic(packet.topic);
      const deliver = (decoded: Decoded) => {
        metrics.messages_received++;
        metrics.samples_received += decoded.samples.length;
        const vehicle = parsed?.vehicle ?? '';
        for (const [reason, n] of Object.entries(decoded.refused))
          metrics.reject(vehicle, reason as RejectReason, n);
        for (const t of decoded.tallies) metrics.frameTally(t);
        pipeline.submit({
          samples: decoded.samples,
          letters: decoded.rejects,
          tallies: decoded.tallies,
          ack: () => done(),
        });
      };
      if (!pool)
        return deliver(safeDecode(packet.topic, payload, { ...decodeContext, now_ms: clock() }, parsed));
      const decoding = pool.decode(packet.topic, payload, clock(), parsed).then(deliver);
      decodes.add(decoding);
      void decoding.finally(() => decodes.delete(decoding));
    };
    return new Promise<void>((resolve) => {
      client.on('connect', () => {
        backoff = RECONNECT_BACKOFF.min_ms;
        client.options.reconnectPeriod = backoff;
        metrics.connections_up = clients.filter((c) => c.connected).length;
        client.subscribe(filters, { qos: 1 }, (err, granted) => {
          const refused = filters.filter((_, i) => {
            const code = granted?.[i]?.qos;
            return code === undefined || code > 2;
          });
          if (err || refused.length) {
            log('subscribe_refused', {
              client: options.clientId,
              filter: refused.join(' '),
              error: err?.message ?? `reason codes ${granted?.map((g) => g.qos).join(', ')}`,
            });
          } else resolve();
        });
      });
    });
  }

  return {
    metrics,
    get metrics_port() {
      return server ? serverPort(server) : undefined;
    },
    async start() {
      if (config.metrics_port >= 0)
        server = await startMetricsServer(metrics, config.metrics_port, config.metrics_host);
      if (config.broker_log) {
        const refusals = brokerRefusals(deps.known_vehicles);
        refusals.writeTo(deps.store);
        brokerLog = { refusals, follower: followMosquittoLog(config.broker_log, refusals.onRefused) };
      }
      await Promise.all(Array.from({ length: config.mqtt.connections }, (_, i) => connectOne(i)));
      log('ingester_started', {
        filter: filters.join(' '),
        connections: config.mqtt.connections,
        store: deps.store.kind,
      });
    },
    async stop() {
      stopping = true;
      await Promise.all(decodes);
      await pipeline.flush();
      pipeline.close();
      await pool?.close();
      await Promise.all(clients.map(endClient));
      await brokerLog?.follower.close();
      await brokerLog?.refusals.close();
      if (server) await new Promise<void>((resolve) => server!.close(() => resolve()));
      log('ingester_stopped', { acked: metrics.messages_acked, spool_segments: spool.segments });
    },
  };
}
