import { HttpError, InfluxDB, type Transport, type WriteOptions } from '@influxdata/influxdb-client';
import {
  type RejectReason,
  SIGNAL_NAMES,
  type Sample,
  type SampleColumns,
  emptyColumns,
} from '@thermargin/shared';
import { DEAD_LETTERS_MEASUREMENT, SAMPLES_MEASUREMENT, deadLetterLine, sampleLine } from './influx-line.ts';
import { v1Transport } from './influx-transport.ts';
import { type InfluxSeries, idLiteral, influxql, timeLiteral } from './influxql.ts';
import type { DeadLetter, DeadLetterCount, DeadLetterQuery, SampleStore, VehicleSpan } from './store.ts';

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

/** bytes: with `gzip`, smaller bodies go uncompressed (the client's own threshold). */
const GZIP_MIN_BYTES = 1000;

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

  /**
   * Writes `lines` with the client's batching and retries; resolves once the server has acknowledged
   * every line, rejects on the first batch the client gives up on. One WriteApi per call, so the lines
   * it confirms are exactly this call's.
   */
  function writeLines(lines: string[], precision: 'ms' | 'ns'): Promise<void> {
    if (lines.length === 0) return Promise.resolve();
    return new Promise<void>((resolve, reject) => {
      let pending = lines.length;
      let settled = false;
      const finish = (error?: Error) => {
        if (settled) return;
        settled = true;
        api.dispose();
        error ? reject(error) : resolve();
      };
      const writeOptions: Partial<WriteOptions> = {
        batchSize: o.batch_lines,
        flushInterval: 0,
        maxRetries: o.max_retries,
        minRetryDelay: o.min_retry_delay_ms,
        maxRetryDelay: o.max_retry_delay_ms,
        maxRetryTime: (o.max_retries + 1) * (o.max_retry_delay_ms + o.timeout_ms),
        maxBufferLines: Math.max(lines.length, o.batch_lines),
        gzipThreshold: o.gzip ? GZIP_MIN_BYTES : Number.POSITIVE_INFINITY,
        writeSuccess(done) {
          pending -= done.length;
          if (pending <= 0) finish();
        },
        // Called after every failed attempt; the client retries unless this was its last word.
        writeFailed(error, _lines, attempt) {
          const retriable = !(error instanceof HttpError) || error.statusCode >= 429;
          if (!retriable || attempt > o.max_retries || /retry time exceeded/i.test(error.message))
            finish(error);
        },
        writeRetrySkipped: () => finish(new Error('influx: lines dropped from the retry buffer')),
      };
      const api = client.getWriteApi(t.org, t.bucket, precision, writeOptions);
      api.writeRecords(lines);
      api.flush().catch(() => {
        // a failed first attempt: the client retries (writeFailed decides when to give up)
      });
    });
  }

  return {
    kind: 'influx',
    writeSamples: (samples) => writeLines(samples.map(sampleLine), 'ms'),
    async readSamples(vehicle, from_ms, to_ms) {
      const [series = []] = await query(
        `SELECT trip, ${SIGNAL_NAMES.join(', ')} FROM ${SAMPLES_MEASUREMENT} WHERE vehicle = ${idLiteral(vehicle)} ` +
          `AND time >= ${timeLiteral(from_ms)} AND time < ${timeLiteral(to_ms)} ORDER BY time ASC`,
      );
      return seriesToColumns(series[0]);
    },
    async listVehicles() {
      const spans = await query(
        `SELECT first(speed_kmh) FROM ${SAMPLES_MEASUREMENT} GROUP BY vehicle; ` +
          `SELECT last(speed_kmh) FROM ${SAMPLES_MEASUREMENT} GROUP BY vehicle; ` +
          `SELECT count(speed_kmh) FROM ${SAMPLES_MEASUREMENT} GROUP BY vehicle`,
      );
      const byVehicle = new Map<string, VehicleSpan>();
      const cell = (s: InfluxSeries, col: number) => s.values[0]?.[col] as number;
      for (const s of spans[0] ?? []) {
        const vehicle = s.tags?.vehicle ?? '';
        byVehicle.set(vehicle, { vehicle, first_ms: cell(s, 0), last_ms: cell(s, 0), count: 0 });
      }
      for (const s of spans[1] ?? []) {
        const span = byVehicle.get(s.tags?.vehicle ?? '');
        if (span) span.last_ms = cell(s, 0);
      }
      for (const s of spans[2] ?? []) {
        const span = byVehicle.get(s.tags?.vehicle ?? '');
        if (span) span.count = cell(s, 1);
      }
      return [...byVehicle.values()].sort((a, b) => (a.vehicle < b.vehicle ? -1 : 1));
    },
    async latestSamples() {
      const [series = []] = await query(
        `SELECT trip, ${SIGNAL_NAMES.join(', ')} FROM ${SAMPLES_MEASUREMENT} GROUP BY vehicle ORDER BY time DESC LIMIT 1`,
      );
      return series
        .map((s) => rowToSample(s.tags?.vehicle ?? '', s.columns, s.values[0] ?? []))
        .sort((a, b) => (a.vehicle < b.vehicle ? -1 : 1));
    },
    writeDeadLetters(letters) {
      const lines = letters.map((l) =>
        deadLetterLine(l, BigInt(Math.round(l.received_ms)) * 1_000_000n + nextSeq()),
      );
      return writeLines(lines, 'ns');
    },
    async readDeadLetters(q: DeadLetterQuery = {}) {
      const where: string[] = [];
      // A letter without a vehicle has no vehicle tag, which `= ''` does not match in InfluxQL.
      if (q.vehicle === '') where.push('vehicle !~ /./');
      else if (q.vehicle !== undefined) where.push(`vehicle = ${idLiteral(q.vehicle)}`);
      if (q.reason !== undefined) where.push(`reason = ${idLiteral(q.reason)}`);
      const [series = []] = await query(
        `SELECT reason, vehicle, detail, topic, excerpt, payload_bytes FROM ${DEAD_LETTERS_MEASUREMENT}` +
          `${where.length ? ` WHERE ${where.join(' AND ')}` : ''} ORDER BY time DESC LIMIT ${Math.max(1, Math.floor(q.limit ?? 100))}`,
      );
      const s = series[0];
      if (!s) return [];
      return s.values.map((row) => {
        const get = (name: string) => row[s.columns.indexOf(name)];
        return {
          received_ms: get('time') as number,
          vehicle: (get('vehicle') as string | null) ?? '',
          reason: get('reason') as RejectReason,
          detail: get('detail') as string,
          topic: get('topic') as string,
          excerpt: get('excerpt') as string,
          payload_bytes: get('payload_bytes') as number,
        } satisfies DeadLetter;
      });
    },
    async countDeadLetters() {
      const [series = []] = await query(
        `SELECT count(payload_bytes) FROM ${DEAD_LETTERS_MEASUREMENT} GROUP BY vehicle, reason`,
      );
      const counts: DeadLetterCount[] = series.map((s) => ({
        vehicle: s.tags?.vehicle ?? '',
        reason: (s.tags?.reason ?? '') as RejectReason,
        count: s.values[0]?.[1] as number,
      }));
      return counts.sort((a, b) => (a.vehicle + a.reason < b.vehicle + b.reason ? -1 : 1));
    },
    async deleteBefore(before_ms) {
      if (o.api === 'v1') {
        await query(
          `DELETE FROM ${SAMPLES_MEASUREMENT} WHERE time < ${timeLiteral(before_ms)}; ` +
            `DELETE FROM ${DEAD_LETTERS_MEASUREMENT} WHERE time < ${timeLiteral(before_ms)}`,
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

function seriesToColumns(s: InfluxSeries | undefined): SampleColumns {
  if (!s) return emptyColumns(0);
  const c = emptyColumns(s.values.length);
  const index = (name: string) => s.columns.indexOf(name);
  const timeCol = index('time');
  const tripCol = index('trip');
  const signalCols = SIGNAL_NAMES.map(index);
  s.values.forEach((row, i) => {
    c.time_ms[i] = row[timeCol] as number;
    c.trip[i] = (row[tripCol] as string | null) ?? undefined;
    signalCols.forEach((col, j) => {
      c[SIGNAL_NAMES[j]!][i] = (row[col] as number | null) ?? Number.NaN;
    });
  });
  return c;
}

function rowToSample(vehicle: string, columns: string[], row: unknown[]): Sample {
  const s: Record<string, unknown> = { vehicle };
  columns.forEach((name, i) => {
    const v = row[i];
    if (v === null || v === undefined) return;
    s[name === 'time' ? 'time_ms' : name] = v;
  });
  return s as unknown as Sample;
}
