import { InfluxDB, type Transport } from '@influxdata/influxdb-client';
import {
  DEAD_LETTERS_MEASUREMENT,
  FRAME_TALLIES_MEASUREMENT,
  SAMPLES_MEASUREMENT,
  deadLetterLine,
  frameTallyLine,
  sampleLine,
} from './influx-line.ts';
import { influxLateMarks, lateDeleteBody } from './influx-late.ts';
import { deadLetterQueries, frameTallyQueries, sampleQueries } from './influx-queries.ts';
import { v1Transport } from './influx-transport.ts';
import { lineWriter } from './influx-write.ts';
import { influxql, timeLiteral } from './influxql.ts';
import type { SampleStore } from './store.ts';

export const INFLUX_DEFAULTS = {
  /** lines per HTTP write: the client splits larger calls (about InfluxDB's best batch size, bench:ingest). */
  batch_lines: 5000,
  /** retries after a failed write (the client's exponential backoff), before the call rejects. */
  max_retries: 3,
  /** ms: the client's first retry delay, and the most any retry waits. */
  min_retry_delay_ms: 200,
  max_retry_delay_ms: 2000,
  /** ms: HTTP timeout of one request. */
  timeout_ms: 10_000,
  /** Gzip write bodies (the client's default): pays on a slow link; on a LAN or loopback it only
   *  costs CPU (about as much as formatting the line: DEVELOPERS.md, bench:ingest) and influxd's to inflate. */
  gzip: false,
};

export interface InfluxStoreOptions {
  url: string;
  /**
   * 'v2': InfluxDB 2.x (and 1.8+/3.x speaking the v2 write API): org + bucket + token.
   * 'v1': InfluxDB 1.x without `/api/v2` (1.6, 1.7): database [+ retention policy], optional user/password.
   */
  api: 'v2' | 'v1';
  /** v2: organisation and bucket; the bucket needs a DBRP mapping for InfluxQL reads (see README). */
  org?: string;
  bucket?: string;
  token?: string;
  /** v1: database and retention policy (default policy when absent). */
  database?: string;
  retention_policy?: string;
  username?: string;
  password?: string;
  batch_lines?: number;
  max_retries?: number;
  min_retry_delay_ms?: number;
  max_retry_delay_ms?: number;
  timeout_ms?: number;
  gzip?: boolean;
}

/** The bucket name used for writes and the db/rp pair used for InfluxQL, for either API. */
function target(o: InfluxStoreOptions): { org: string; bucket: string; db: string; rp: string | undefined } {
  if (o.api === 'v2') {
    if (!o.org || !o.bucket) throw new Error('createInfluxStore: api v2 needs org and bucket');
    return { org: o.org, bucket: o.bucket, db: o.bucket, rp: undefined };
  }
  if (!o.database) throw new Error('createInfluxStore: api v1 needs database');
  const rp = o.retention_policy || undefined;
  return { org: '', bucket: rp ? `${o.database}/${rp}` : o.database, db: o.database, rp };
}

/**
 * The InfluxDB sample store: writes through the client's write API (influx-write.ts), reads with
 * InfluxQL (influx-queries.ts), the 1.x write path through a rewriting transport (influx-transport.ts).
 */
export function createInfluxStore(options: InfluxStoreOptions): SampleStore {
  const o = { ...INFLUX_DEFAULTS, ...options };
  const t = target(o);
  const base = new InfluxDB({
    url: o.url,
    token: o.api === 'v2' ? o.token : undefined,
    timeout: o.timeout_ms,
  });
  const credentials = o.username ? { username: o.username, password: o.password ?? '' } : undefined;
  const transport: Transport = o.api === 'v1' ? v1Transport(base.transport, credentials) : base.transport;
  const client = new InfluxDB({ url: o.url, transport });
  const query = (q: string) => influxql(transport, t.db, t.rp, q);
  let letterSeq = BigInt(Math.floor(Math.random() * 1e5)) * 10n;
  const late = influxLateMarks(query);

  const writeLines = lineWriter(client, t, o);

  return {
    kind: 'influx',
    async writeSamples(samples) {
      if (samples.length === 0) return;
      const early = await late.before(samples);
      await writeLines(samples.map(sampleLine), 'ms');
      // After the samples: a mark is never seen before what it marks is readable.
      await writeLines(await late.lines(samples, early, Date.now()), 'ms');
      await late.written(samples);
    },
    ...sampleQueries(query),
    writeDeadLetters(letters) {
      const lines = letters.map((l) =>
        deadLetterLine(l, BigInt(Math.round(l.received_ms)) * 1_000_000n + nextSeq()),
      );
      return writeLines(lines, 'ns');
    },
    ...deadLetterQueries(query),
    lateMarks: () => late.read(),
    async clearLateMarks(marks) {
      if (marks.length === 0) return;
      if (o.api === 'v1') {
        await query(late.deleteStatements(marks));
        return;
      }
      const path = `/api/v2/delete?${new URLSearchParams({ org: t.org, bucket: t.bucket })}`;
      for (const m of marks) await transport.request(path, lateDeleteBody(m), { method: 'POST' });
    },
    writeFrameTallies: (tallies) => writeLines(tallies.map(frameTallyLine), 'ms'),
    ...frameTallyQueries(query),
    async deleteBefore(before_ms) {
      if (o.api === 'v1') {
        await query(
          [SAMPLES_MEASUREMENT, DEAD_LETTERS_MEASUREMENT, FRAME_TALLIES_MEASUREMENT]
            .map((m) => `DELETE FROM ${m} WHERE time < ${timeLiteral(before_ms)}`)
            .join('; '),
        );
        return;
      }
      // 2.x has no InfluxQL DELETE; its delete API takes a time range (bucket retention is the usual way).
      const path = `/api/v2/delete?${new URLSearchParams({ org: t.org, bucket: t.bucket })}`;
      const body = { start: '1970-01-01T00:00:00Z', stop: new Date(Math.ceil(before_ms) - 1).toISOString() };
      await transport.request(path, body, { method: 'POST' });
    },
    async ping() {
      await query('SHOW MEASUREMENTS LIMIT 1');
    },
    async close() {},
  };

  function nextSeq(): bigint {
    letterSeq = (letterSeq + 1n) % 1_000_000n;
    return letterSeq;
  }
}
