import type { Transport } from '@influxdata/influxdb-client';
import { isValidId } from '@thermargin/shared';

/** One series of an InfluxQL answer (`epoch=ms`: the time column is epoch milliseconds). */
export interface InfluxSeries {
  name: string;
  tags?: Record<string, string>;
  columns: string[];
  values: unknown[][];
}

interface QueryAnswer {
  results?: { statement_id: number; series?: InfluxSeries[]; error?: string }[];
  error?: string;
}

/**
 * Runs InfluxQL statements over `/query` (1.x natively; 2.x through its v1-compatible endpoint with a
 * DBRP mapping for the bucket) and returns each statement's series.
 */
export async function influxql(
  transport: Transport,
  db: string,
  rp: string | undefined,
  q: string,
): Promise<InfluxSeries[][]> {
  const params = new URLSearchParams({ db, q, epoch: 'ms' });
  if (rp) params.set('rp', rp);
  const answer = (await transport.request('/query', params.toString(), {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'application/json' },
  })) as QueryAnswer;
  if (answer.error) throw new Error(`influxql: ${answer.error} (in: ${q})`);
  return (answer.results ?? []).map((r) => {
    if (r.error) throw new Error(`influxql: ${r.error} (in: ${q})`);
    return r.series ?? [];
  });
}

/** A quoted InfluxQL string literal for an id (ids hold no quote or backslash; anything else is refused). */
export function idLiteral(id: string): string {
  if (!isValidId(id)) throw new Error(`influxql: ${JSON.stringify(id)} is not a valid id`);
  return `'${id}'`;
}

/** A time literal: integer epoch ms (stored times are integers, so rounding a bound up keeps `>=`/`<` exact). */
export function timeLiteral(time_ms: number): string {
  if (!Number.isFinite(time_ms)) throw new Error(`influxql: time ${time_ms} is not finite`);
  return `${Math.ceil(time_ms)}ms`;
}
