import {
  type RejectReason,
  SIGNAL_NAMES,
  type Sample,
  type SampleColumns,
  emptyColumns,
} from '@thermargin/shared';
import { DEAD_LETTERS_MEASUREMENT, FRAME_TALLIES_MEASUREMENT, SAMPLES_MEASUREMENT } from './influx-line.ts';
import { type InfluxSeries, idLiteral, timeLiteral } from './influxql.ts';
import {
  type DeadLetter,
  type DeadLetterCount,
  type DeadLetterQuery,
  FRAME_TALLY_COUNTS,
  type FrameTotals,
  type SampleStore,
  type VehicleSpan,
} from './store.ts';

/** Runs InfluxQL statements and returns each one's series. */
type Query = (q: string) => Promise<InfluxSeries[][]>;

/** The sample store's reads as InfluxQL: one vehicle's range, every vehicle's span, the newest samples. */
export function sampleQueries(
  query: Query,
): Pick<SampleStore, 'readSamples' | 'listVehicles' | 'latestSamples'> {
  return {
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
  };
}

/** The dead letters' reads as InfluxQL. */
export function deadLetterQueries(query: Query): Pick<SampleStore, 'readDeadLetters' | 'countDeadLetters'> {
  return {
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
  };
}

/** The frame tallies' sums per vehicle as InfluxQL. */
export function frameTallyQueries(query: Query): Pick<SampleStore, 'frameTotals'> {
  return {
    async frameTotals() {
      const [series = []] = await query(
        `SELECT count(frames) AS batches, ${FRAME_TALLY_COUNTS.map((c) => `sum(${c}) AS ${c}`).join(', ')} FROM ${FRAME_TALLIES_MEASUREMENT} GROUP BY vehicle`,
      );
      return series
        .map((s) => {
          const row = s.values[0] ?? [];
          const out: Record<string, unknown> = { vehicle: s.tags?.vehicle ?? '' };
          s.columns.forEach((c, i) => {
            if (c !== 'time') out[c] = row[i] ?? 0;
          });
          return out as FrameTotals;
        })
        .sort((a, b) => (a.vehicle < b.vehicle ? -1 : 1));
    },
  };
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
