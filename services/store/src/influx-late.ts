import type { Sample } from '@thermargin/shared';
import { SAMPLES_MEASUREMENT } from './influx-line.ts';
import { idLiteral, type InfluxSeries, timeLiteral } from './influxql.ts';
import { type LateMark, storedTime } from './store.ts';

export const LATE_MEASUREMENT = 'late_samples';

type Query = (q: string) => Promise<InfluxSeries[][]>;

/**
 * Late-sample marks in InfluxDB: a point per late write and vehicle, `late_samples,vehicle={id}
 * from_ms=…i,count=…i {ms}`, its time (unique per vehicle in this process) its handle for the delete.
 * "Late" is judged against the newest sample this process knows of per vehicle: the store's at the
 * first write (one query), then its own writes. A replica that has not written a vehicle lately may
 * judge a batch seconds behind another replica's newest as not late; anything older than what it has
 * written itself, or than the store held at its start, is marked.
 */
export function influxLateMarks(query: Query) {
  let newest: Promise<Map<string, number>> | undefined;
  const lastMark = new Map<string, number>();

  const loadNewest = async () => {
    const [series = []] = await query(`SELECT last(speed_kmh) FROM ${SAMPLES_MEASUREMENT} GROUP BY vehicle`);
    return new Map(series.map((s) => [s.tags?.vehicle ?? '', s.values[0]?.[0] as number]));
  };

  return {
    /** The mark lines for `samples` (judged before they are written; none when nothing is late). */
    async lines(samples: readonly Sample[], now_ms: number): Promise<string[]> {
      newest ??= loadNewest().catch((e) => {
        newest = undefined;
        throw e;
      });
      const known = await newest;
      const late = new Map<string, { from_ms: number; count: number }>();
      for (const s of samples) {
        const t = storedTime(s.time_ms);
        if (!(t < (known.get(s.vehicle) ?? Number.NEGATIVE_INFINITY))) continue;
        const m = late.get(s.vehicle);
        if (m) {
          m.from_ms = Math.min(m.from_ms, t);
          m.count++;
        } else late.set(s.vehicle, { from_ms: t, count: 1 });
      }
      return [...late].map(([vehicle, m]) => {
        const at = Math.max(Math.round(now_ms), (lastMark.get(vehicle) ?? 0) + 1);
        lastMark.set(vehicle, at);
        return `${LATE_MEASUREMENT},vehicle=${vehicle} from_ms=${m.from_ms}i,count=${m.count}i ${at}`;
      });
    },
    /** After `samples` were written: the newest known per vehicle moves on. */
    async written(samples: readonly Sample[]): Promise<void> {
      const known = await newest;
      if (!known) return;
      for (const s of samples) {
        const t = storedTime(s.time_ms);
        if (t > (known.get(s.vehicle) ?? Number.NEGATIVE_INFINITY)) known.set(s.vehicle, t);
      }
    },
    async read(): Promise<LateMark[]> {
      const [series = []] = await query(`SELECT from_ms, count FROM ${LATE_MEASUREMENT} GROUP BY vehicle`);
      return series.flatMap((s) =>
        s.values.map((row) => ({
          vehicle: s.tags?.vehicle ?? '',
          from_ms: row[1] as number,
          count: row[2] as number,
          id: String(row[0]),
        })),
      );
    },
    /** v1: InfluxQL DELETE of each mark's point. */
    deleteStatements(marks: readonly LateMark[]): string {
      return marks
        .map((m) => {
          const at = timeLiteral(Number(m.id));
          return `DELETE FROM ${LATE_MEASUREMENT} WHERE vehicle = ${idLiteral(m.vehicle)} AND time >= ${at} AND time <= ${at}`;
        })
        .join('; ');
    },
  };
}

/** v2: the delete API's body for one mark's point (a 1 ns range at its time). */
export function lateDeleteBody(m: LateMark): { start: string; stop: string; predicate: string } {
  const iso = new Date(Number(m.id)).toISOString();
  return {
    start: iso,
    stop: iso.replace(/Z$/, '000001Z'),
    predicate: `_measurement="${LATE_MEASUREMENT}" AND vehicle="${m.vehicle}"`,
  };
}
