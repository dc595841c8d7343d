import { HttpError, type InfluxDB, type WriteOptions } from '@influxdata/influxdb-client';
import type { INFLUX_DEFAULTS } from './influx.ts';

/** bytes: with `gzip`, smaller bodies go uncompressed (the client's own threshold). */
const GZIP_MIN_BYTES = 1000;

/** Where lines go: the org and bucket of the client's write API (v1: `db/rp`). */
export interface WriteTarget {
  org: string;
  bucket: string;
}

/**
 * A function that writes line-protocol `lines` through `client`, with its batching and retries as `o`
 * sets them.
 */
export function lineWriter(client: InfluxDB, t: WriteTarget, o: typeof INFLUX_DEFAULTS) {
  /**
   * Writes `lines` with the client's batching and retries; resolves once the server has acknowledged
   * every line, rejects on the first batch the client gives up on. One WriteApi per call, so the lines
   * it confirms are exactly this call's.
   */
  return function writeLines(lines: string[], precision: 'ms' | 'ns'): Promise<void> {
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
  };
}
