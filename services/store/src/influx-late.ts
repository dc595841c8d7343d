import type { Sample } from '@thermargin/shared';
import { SAMPLES_MEASUREMENT } from './influx-line.ts';
import { idLiteral, type InfluxSeries, timeLiteral } from './influxql.ts';
import { type LateMark, storedTime } from './store.ts';

export const LATE_MEASUREMENT = 'late_samples';

type Query = (q: string) => Promise<InfluxSeries[][]>;

/** A vehicle's late samples in one write: the earliest time and how many. */
type LateSpan = { from_ms: number; count: number };

/** Per vehicle, the time of its row in a `SELECT last(…) … GROUP BY vehicle` answer. */
const lastByVehicle = (series: InfluxSeries[]) =>
  new Map(series.map((s) => [s.tags?.vehicle ?? '', s.values[0]?.[0] as number]));

/**
 * Late-sample marks in InfluxDB: a point per late write and vehicle, `late_samples,vehicle={id}
 * from_ms=…i,count=…i {ms}`, its time (unique per vehicle in this process) its handle for the delete.
 * "Late" is judged twice. Before the write, against the newest sample this process knows of per
 * vehicle (the store's at the first write, then its own writes). After it, against what other writers
 * stored meanwhile: a sample of the vehicle newer than the whole batch means an analyzer may already have
 * read past it (ingester replicas share a subscription, so a vehicle's batches land out of order), and
 * the batch is marked from its earliest sample. Without the second look a replica that had not written
 * a vehicle lately judged a batch behind another replica's newest as not late, and its samples were
 * never analysed.
 */
export function influxLateMarks(query: Query) {
  let newest: Promise<Map<string, number>> | undefined;
  const lastMark = new Map<string, number>();

  const loadNewest = async () => {
    const [series = []] = await query(`SELECT last(speed_kmh) FROM ${SAMPLES_MEASUREMENT} GROUP BY vehicle`);
    return lastByVehicle(series);
  };

  /** Per vehicle, the samples of `samples` older than `newer(vehicle)`: their earliest time and count. */
  const behind = (samples: readonly Sample[], newer: (vehicle: string) => number | undefined) => {
    const late = new Map<string, LateSpan>();
    for (const s of samples) {
      const t = storedTime(s.time_ms);
      if (!(t < (newer(s.vehicle) ?? Number.NEGATIVE_INFINITY))) continue;
      const m = late.get(s.vehicle);
      if (m) {
        m.from_ms = Math.min(m.from_ms, t);
        m.count++;
      } else late.set(s.vehicle, { from_ms: t, count: 1 });
    }
    return late;
  };

  return {
    /** Before `samples` are written: the vehicles they are late for by what this process knows. */
    async before(samples: readonly Sample[]): Promise<Map<string, LateSpan>> {
      newest ??= loadNewest().catch((e) => {
        newest = undefined;
        throw e;
      });
      const known = await newest;
      return behind(samples, (v) => known.get(v));
    },
    /**
     * After `samples` are written: the mark lines, adding the vehicles another writer stored a newer
     * sample of than the whole batch (one query over the time after the batch).
     */
    async lines(samples: readonly Sample[], early: Map<string, LateSpan>, now_ms: number): Promise<string[]> {
      let last = Number.NEGATIVE_INFINITY;
      const vehicles = new Set<string>();
      for (const s of samples) {
        last = Math.max(last, storedTime(s.time_ms));
        vehicles.add(s.vehicle);
      }
      if (vehicles.size === 0) return [];
      const which = [...vehicles].map((v) => `vehicle = ${idLiteral(v)}`).join(' OR ');
      const [series = []] = await query(
        `SELECT last(speed_kmh) FROM ${SAMPLES_MEASUREMENT} WHERE (${which}) AND time > ${timeLiteral(last)} GROUP BY vehicle`,
      );
      const elsewhere = lastByVehicle(series);
      const late = new Map([...behind(samples, (v) => elsewhere.get(v)), ...early]);
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
