import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { encodeSamplePayload, sampleTopic, type WireSample } from '@thermargin/shared';
import { createSqliteStore } from '@thermargin/store';
import mqtt, { type MqttClient } from 'mqtt';
import { audit, fleetStream, sleep } from '../ingester/support.ts';
import { freePort, waitFor } from '../../support/servers/free-port.ts';
import type { SmallDisk } from '../../support/small-disk.ts';
import { type RunningStack, runStack } from './run-stack.ts';

/** What one crash run saw: messages and samples the vehicles sent, had acknowledged, and the store kept. */
export interface CrashRun {
  fault: 'kill' | 'disk_full';
  messages_sent: number;
  /** Acknowledged to the vehicles when the stack was killed. */
  acked_at_kill: number;
  samples_acked_at_kill: number;
  /** Of those acknowledged samples, how many the store did not hold after the kill. */
  acked_samples_lost: number;
  /** Samples stored right after the kill (before any resend). */
  stored_at_kill: number;
  /** After the restart and the vehicles' resends. */
  samples_sent: number;
  samples_stored: number;
  duplicates: number;
  checksum_ok: boolean;
  /** The console's lines about the store before the kill (store_down with its reason, a refused spool). */
  console_faults: string[];
}

const SAMPLES_PER_MESSAGE = 50;
/** Publishes a vehicle has in flight at once (a logger's send window). */
const WINDOW = 8;

/**
 * `npm start` (embedded broker and SQLite, no demo fleet) on `disk` or a temp dir; two vehicles publish
 * a counted QoS 1 stream with their own logins, resending on reconnect what was not acknowledged (as a
 * logger keeps its buffer until then). Mid-stream the stack is killed with SIGKILL — for `disk_full`
 * after the data disk was filled and acknowledgements stopped — then the disk is freed, the store is
 * audited against what was acknowledged, the stack is started again on the same data and port, and
 * the stream finishes. `cut` (0…1) places the kill.
 */
export async function crashRun(o: {
  fault: 'kill' | 'disk_full';
  messages_per_vehicle: number;
  cut: number;
  disk?: SmallDisk;
}): Promise<CrashRun> {
  const data = o.disk?.dir ?? mkdtempSync(join(tmpdir(), 'thermargin-crash-'));
  const env = {
    THERMARGIN_SIMULATE: '0',
    THERMARGIN_DEMO_VEHICLES: '2',
    THERMARGIN_DEMO_DAYS: '1',
    THERMARGIN_BROKER_PORT: String(await freePort()),
  };
  let stack: RunningStack | undefined = await runStack(env, data);
  const url = `mqtt://127.0.0.1:${env.THERMARGIN_BROKER_PORT}`;
  const state = JSON.parse(readFileSync(join(data, 'demo-state.json'), 'utf8')) as {
    vehicle_passwords: Record<string, string>;
  };
  const ids = Object.keys(state.vehicle_passwords).sort();
  const stream = fleetStream(ids, o.messages_per_vehicle * SAMPLES_PER_MESSAGE);
  const acked = new Set<string>(); // `${vehicle}#${message}`
  const clients: MqttClient[] = [];
  const sending = stream.map(async (samples) => {
    const vehicle = samples[0]!.vehicle;
    const c = await mqtt.connectAsync(url, {
      username: vehicle,
      password: state.vehicle_passwords[vehicle],
      clientId: vehicle,
      protocolVersion: 4,
      reconnectPeriod: 250,
    });
    clients.push(c);
    const window = new Set<Promise<void>>();
    for (let m = 0; m < o.messages_per_vehicle; m++) {
      const part = samples.slice(m * SAMPLES_PER_MESSAGE, (m + 1) * SAMPLES_PER_MESSAGE);
      const p: Promise<void> = c
        .publishAsync(sampleTopic(vehicle), encodeSamplePayload(part), { qos: 1 })
        .then(() => {
          acked.add(`${vehicle}#${m}`);
          window.delete(p);
        });
      window.add(p);
      if (window.size >= WINDOW) await Promise.race(window);
    }
    await Promise.all(window);
  });
  const total = ids.length * o.messages_per_vehicle;
  const cutAt = Math.max(1, Math.round(total * o.cut));
  try {
    await waitFor('acknowledgements before the cut', async () => acked.size >= cutAt, 120_000);
    if (o.fault === 'disk_full') {
      o.disk!.fill();
      // Until the acknowledgements stop: what is acknowledged now must have been stored before the disk filled.
      let seen = -1;
      while (seen !== acked.size) {
        seen = acked.size;
        await sleep(2000);
      }
    }
    const consoleFaults = stack
      .log()
      .split('\n')
      .filter((l) => /store_down|spool_unwritable/.test(l))
      .map((l) => l.trim());
    const child = stack.child;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGKILL');
    await exited;
    stack = undefined;
    const ackedAtKill = [...acked];
    o.disk?.free();

    const stored = await storedTimes(join(data, 'samples.db'), ids);
    const byVehicle = new Map(stream.map((s) => [s[0]!.vehicle, s]));
    let lost = 0;
    for (const key of ackedAtKill) {
      const [vehicle, m] = key.split('#') as [string, string];
      const part = byVehicle
        .get(vehicle)!
        .slice(Number(m) * SAMPLES_PER_MESSAGE, (Number(m) + 1) * SAMPLES_PER_MESSAGE);
      for (const s of part) if (!stored.get(vehicle)!.has(s.time as number)) lost++;
    }
    const storedAtKill = [...stored.values()].reduce((n, t) => n + t.size, 0);

    stack = await runStack(env, data);
    await Promise.all(sending);
    await Promise.all(clients.map((c) => c.endAsync()));
    await waitForIngest(stack, stream);
    const code = await stack.stop();
    stack = undefined;
    if (code !== 0) throw new Error(`the restarted stack exited with ${code}`);
    const store = createSqliteStore({ path: join(data, 'samples.db') });
    const a = await audit(store, stream);
    await store.close();
    return {
      fault: o.fault,
      messages_sent: total,
      acked_at_kill: ackedAtKill.length,
      samples_acked_at_kill: ackedAtKill.length * SAMPLES_PER_MESSAGE,
      acked_samples_lost: lost,
      stored_at_kill: storedAtKill,
      samples_sent: a.expected,
      samples_stored: a.stored,
      duplicates: a.duplicates,
      checksum_ok: a.checksum_ok,
      console_faults: consoleFaults,
    };
  } finally {
    for (const c of clients) c.end(true);
    if (stack?.child.exitCode === null) stack.child.kill('SIGKILL');
  }
}

/** Each vehicle's stored sample times, read from the SQLite file while no stack runs. */
async function storedTimes(path: string, ids: readonly string[]): Promise<Map<string, Set<number>>> {
  const store = createSqliteStore({ path });
  const out = new Map<string, Set<number>>();
  for (const id of ids) out.set(id, new Set((await store.readSamples(id, 0, 8.64e15)).time_ms));
  await store.close();
  return out;
}

/**
 * Every publish was acknowledged, so should be stored: waits (at most 30 s) for the API to count them
 * all; what is missing then is lost, and the audit says how much.
 */
async function waitForIngest(stack: RunningStack, stream: WireSample[][]): Promise<void> {
  const want = stream.reduce((n, s) => n + s.length, 0);
  await waitFor(
    'the stack counting every sample',
    async () => (await stack.get<{ ingest: { samples: number } }>('/api/status')).ingest.samples >= want,
    30_000,
  ).catch(() => {});
}
