import {
  copyColumns,
  emptyColumns,
  SIGNAL_NAMES,
  SIGNALS,
  type Sample,
  type SampleColumns,
  sliceColumns,
} from '@thermargin/shared';
import { lowerBound } from '@thermargin/shared/array-index';
import type Database from 'better-sqlite3';
import { type BLOCK_DEFAULTS, decodeBlock, encodeBlock, isHole, mergeRows } from './sqlite-blocks.ts';
import { storedTime, type VehicleSpan } from './store.ts';

/** Signal columns in table order: the SIGNALS table is the one source. */
const COLUMNS = ['vehicle', 'time_ms', 'trip', ...SIGNAL_NAMES] as const;

function samplesSql(): string {
  const signals = SIGNAL_NAMES.map((n) => `${n} REAL${SIGNALS[n].required ? ' NOT NULL' : ''}`).join(', ');
  // Clustered on (vehicle, time): a trip read is one contiguous range of the table, not index lookups.
  return `
    CREATE TABLE IF NOT EXISTS samples (
      vehicle TEXT NOT NULL, time_ms INTEGER NOT NULL, trip TEXT, ${signals},
      PRIMARY KEY (vehicle, time_ms)) WITHOUT ROWID;
    CREATE TABLE IF NOT EXISTS sample_blocks (
      id INTEGER PRIMARY KEY, vehicle TEXT NOT NULL, first_ms INTEGER NOT NULL, last_ms INTEGER NOT NULL,
      n INTEGER NOT NULL, columns BLOB NOT NULL, trips TEXT NOT NULL);
    CREATE UNIQUE INDEX IF NOT EXISTS sample_blocks_by_time ON sample_blocks (vehicle, first_ms, last_ms);`;
}

/** Blocks of @vehicle overlapping [@from, @to): ranges are disjoint, so the last one starting at or
 *  before @from and those starting inside. */
const BLOCKS_IN = `FROM sample_blocks WHERE vehicle = @vehicle AND first_ms < @to AND last_ms >= @from
  AND first_ms >= COALESCE((SELECT MAX(first_ms) FROM sample_blocks
    WHERE vehicle = @vehicle AND first_ms <= @from), @from) ORDER BY first_ms`;

type BlockMeta = { id: number; first_ms: number; last_ms: number };
type BlockRow = { id: number; n: number; columns: Buffer; trips: string };

/** Told, inside the write's transaction, of each vehicle's sorted times and its newest stored time before them. */
export type BeforeVehicleWrite = (vehicle: string, times: Float64Array, newest_ms: number | null) => void;

const decode = (r: BlockRow) => decodeBlock(r.n, r.columns, r.trips);

/**
 * The sample tables of the SQLite store. `samples` holds rows as written (idempotent on vehicle +
 * time); once a vehicle has a block's worth of rows, the oldest are packed into `sample_blocks`
 * (sqlite-blocks.ts), and a write of `min_pack` or more for one vehicle is packed at once. Invariants
 * that keep reads a plain merge: a vehicle's blocks cover disjoint time ranges, no row lies inside a
 * block's range (a write there rewrites the block), and its newest sample is a row.
 */
export function createSampleTables(
  db: Database.Database,
  block: typeof BLOCK_DEFAULTS,
  beforeWrite?: BeforeVehicleWrite,
) {
  db.exec(samplesSql());
  const q = sampleStatements(db);
  const writeVehicle = blockWriter(q, block, beforeWrite);
  return {
    /** One transaction for the whole write, vehicle by vehicle. */
    write: db.transaction((samples: readonly Sample[]) => {
      const byVehicle = new Map<string, Sample[]>();
      for (const s of samples) {
        const list = byVehicle.get(s.vehicle);
        if (list) list.push(s);
        else byVehicle.set(s.vehicle, [s]);
      }
      for (const [vehicle, list] of byVehicle) writeVehicle(vehicle, list);
    }),
    read: db.transaction(rangeReader(q)),
    spans: () => q.selectSpans.all() as VehicleSpan[],
    latest: () => (q.selectLatest.all() as Record<string, unknown>[]).map(rowToSample),
    /** Drops samples older than `before_ms`, cutting the block that straddles it; inside the caller's transaction. */
    deleteBefore(before_ms: number): void {
      for (const r of q.straddling.all(before_ms, before_ms) as BlockRow[]) {
        const c = decode(r);
        const kept = encodeBlock(c, lowerBound(c.time_ms, before_ms), c.n);
        q.updateBlock.run({ id: r.id, ...kept });
      }
      q.deleteBlocks.run(before_ms);
      q.deleteSamples.run(before_ms);
    },
  };
}

/** The prepared statements of the two sample tables. */
function sampleStatements(db: Database.Database) {
  const insertSample = db.prepare(
    `INSERT OR REPLACE INTO samples (${COLUMNS.join(', ')}) VALUES (${COLUMNS.map(() => '?').join(', ')})`,
  );
  const rowSql = `SELECT time_ms, trip, ${SIGNAL_NAMES.join(', ')} FROM samples`;
  const selectRange = db
    .prepare(`${rowSql} WHERE vehicle = ? AND time_ms >= ? AND time_ms < ? ORDER BY time_ms`)
    .raw();
  const selectOldest = db.prepare(`${rowSql} WHERE vehicle = ? ORDER BY time_ms LIMIT ?`).raw();
  const countRows = db.prepare('SELECT COUNT(*) FROM samples WHERE vehicle = ?').pluck();
  const newestRow = db.prepare('SELECT MAX(time_ms) FROM samples WHERE vehicle = ?').pluck();
  const deleteRows = db.prepare('DELETE FROM samples WHERE vehicle = ? AND time_ms >= ? AND time_ms <= ?');
  const blockMeta = db.prepare(`SELECT id, first_ms, last_ms ${BLOCKS_IN}`);
  const blockData = db.prepare(`SELECT id, n, columns, trips ${BLOCKS_IN}`);
  const previousEnd = db
    .prepare(
      'SELECT last_ms FROM sample_blocks WHERE vehicle = ? AND first_ms < ? ORDER BY first_ms DESC LIMIT 1',
    )
    .pluck();
  const blockById = db.prepare('SELECT id, n, columns, trips FROM sample_blocks WHERE id = ?');
  const insertBlock = db.prepare(
    `INSERT INTO sample_blocks (vehicle, first_ms, last_ms, n, columns, trips)
     VALUES (@vehicle, @first_ms, @last_ms, @n, @columns, @trips)`,
  );
  const updateBlock = db.prepare(
    `UPDATE sample_blocks SET first_ms = @first_ms, last_ms = @last_ms, n = @n, columns = @columns,
     trips = @trips WHERE id = @id`,
  );
  const selectSpans = db.prepare(
    `SELECT vehicle, MIN(first_ms) AS first_ms, MAX(last_ms) AS last_ms, SUM(n) AS count FROM (
       SELECT vehicle, MIN(time_ms) AS first_ms, MAX(time_ms) AS last_ms, COUNT(*) AS n FROM samples GROUP BY vehicle
       UNION ALL
       SELECT vehicle, MIN(first_ms), MAX(last_ms), SUM(n) FROM sample_blocks GROUP BY vehicle)
     GROUP BY vehicle ORDER BY vehicle`,
  );
  // The newest sample of a vehicle is always a row (see above).
  const selectLatest = db.prepare(
    `SELECT s.* FROM samples s JOIN (SELECT vehicle, MAX(time_ms) AS t FROM samples GROUP BY vehicle) m
     ON s.vehicle = m.vehicle AND s.time_ms = m.t ORDER BY s.vehicle`,
  );
  const deleteSamples = db.prepare('DELETE FROM samples WHERE time_ms < ?');
  const deleteBlocks = db.prepare('DELETE FROM sample_blocks WHERE last_ms < ?');
  const straddling = db.prepare(
    'SELECT id, n, columns, trips FROM sample_blocks WHERE first_ms < ? AND last_ms >= ?',
  );
  return {
    insertSample,
    selectRange,
    selectOldest,
    countRows,
    newestRow,
    deleteRows,
    blockMeta,
    blockData,
    previousEnd,
    blockById,
    insertBlock,
    updateBlock,
    selectSpans,
    selectLatest,
    deleteSamples,
    deleteBlocks,
    straddling,
  };
}

type SampleStatements = ReturnType<typeof sampleStatements>;

/**
 * The write path: each vehicle's new samples become rows, rewrite the blocks whose range they fall in,
 * or are packed into blocks at once; a vehicle's oldest rows are packed once there are a block's worth.
 */
function blockWriter(q: SampleStatements, block: typeof BLOCK_DEFAULTS, beforeWrite?: BeforeVehicleWrite) {
  const { insertSample, selectRange, selectOldest, countRows, newestRow, deleteRows } = q;
  const { blockMeta, previousEnd, blockById, insertBlock, updateBlock } = q;
  /** Rows this connection wrote per vehicle since it last looked whether to compact. */
  const unpacked = new Map<string, number>();

  const values = new Array<unknown>(COLUMNS.length);
  function insertRows(vehicle: string, c: SampleColumns): void {
    values[0] = vehicle;
    for (let i = 0; i < c.n; i++) {
      values[1] = c.time_ms[i];
      values[2] = c.trip[i] ?? null;
      for (let j = 0; j < SIGNAL_NAMES.length; j++) {
        const x = c[SIGNAL_NAMES[j]!][i]!;
        values[j + 3] = Number.isNaN(x) ? null : x;
      }
      insertSample.run(values);
    }
  }

  /** Packs `c` (no row or block inside its range) into blocks, cut where another block or a hole lies between. */
  function seal(vehicle: string, c: SampleColumns, around: readonly BlockMeta[]): void {
    let from = 0;
    let b = 0;
    let cadence: number | null = null;
    for (let i = 1; i <= c.n; i++) {
      while (b < around.length && around[b]!.last_ms < c.time_ms[i - 1]!) b++;
      const dt = i < c.n ? c.time_ms[i]! - c.time_ms[i - 1]! : 0;
      const cut =
        i === c.n ||
        i - from === block.samples ||
        (b < around.length && around[b]!.first_ms < c.time_ms[i]!) ||
        isHole(dt, cadence, block);
      if (!cut) {
        cadence = cadence === null ? dt : Math.min(cadence, dt);
        continue;
      }
      insertBlock.run({ vehicle, ...encodeBlock(c, from, i) });
      from = i;
      cadence = null;
    }
  }

  /** Moves the oldest rows of a vehicle into blocks, whole blocks only, keeping the newest as a row. */
  function compact(vehicle: string): void {
    const count = countRows.get(vehicle) as number;
    const k = Math.min(block.max_compact_samples, Math.floor((count - 1) / block.samples) * block.samples);
    unpacked.set(vehicle, count - 1 - k >= block.samples ? block.samples : 0);
    if (k <= 0) return;
    const c = rowsToColumns(selectOldest.all(vehicle, k) as unknown[][]);
    const last = c.time_ms[c.n - 1]!;
    const around = blockMeta.all({ vehicle, from: c.time_ms[0], to: last + 1 }) as BlockMeta[];
    deleteRows.run(vehicle, c.time_ms[0], last);
    seal(vehicle, c, around);
  }

  function writeVehicle(vehicle: string, list: readonly Sample[]): void {
    const c = sortedUnique(list);
    beforeWrite?.(vehicle, c.time_ms, newestRow.get(vehicle) as number | null);
    const around = blockMeta.all({
      vehicle,
      from: c.time_ms[0],
      to: c.time_ms[c.n - 1]! + 1,
    }) as BlockMeta[];
    // Samples inside a block's range rewrite that block; the rest (`outside`) become rows or blocks.
    const outside: [number, number][] = [];
    let i = 0;
    for (const m of around) {
      const lo = lowerBound(c.time_ms, m.first_ms, i);
      const hi = lowerBound(c.time_ms, m.last_ms + 1, lo);
      if (lo > i) outside.push([i, lo]);
      if (hi > lo) {
        const merged = mergeRows(decode(blockById.get(m.id) as BlockRow), sliceColumns(c, lo, hi));
        updateBlock.run({ id: m.id, ...encodeBlock(merged, 0, merged.n) });
      }
      i = hi;
    }
    if (i < c.n) outside.push([i, c.n]);
    const rest = outside.length === 1 ? sliceColumns(c, outside[0]![0], outside[0]![1]) : pick(c, outside);
    if (rest.n === 0) return;
    if (rest.n < block.min_pack) {
      insertRows(vehicle, rest);
      const n = (unpacked.get(vehicle) ?? 0) + rest.n;
      unpacked.set(vehicle, n);
      if (n >= block.samples) compact(vehicle);
      return;
    }
    // Packed at once with the rows from the previous block on (none lies between), keeping the
    // vehicle's newest sample a row.
    const last = rest.time_ms[rest.n - 1]!;
    const from =
      ((previousEnd.get(vehicle, rest.time_ms[0]) as number | undefined) ?? Number.NEGATIVE_INFINITY) + 1;
    const old = rowsToColumns(selectRange.all(vehicle, from, last + 1) as unknown[][]);
    const all = old.n ? mergeRows(old, rest) : rest;
    deleteRows.run(vehicle, from, last);
    const newest = newestRow.get(vehicle) as number | null;
    const keep = newest === null || newest < last ? 1 : 0;
    seal(vehicle, sliceColumns(all, 0, all.n - keep), around);
    if (keep) insertRows(vehicle, sliceColumns(all, all.n - 1, all.n));
  }

  return writeVehicle;
}

/** One vehicle's samples with from_ms ≤ time < to_ms: its blocks merged with its rows, by time. */
function rangeReader(q: SampleStatements) {
  const { selectRange, blockData } = q;
  return (vehicle: string, from_ms: number, to_ms: number): SampleColumns => {
    const tail = rowsToColumns(selectRange.all(vehicle, from_ms, to_ms) as unknown[][]);
    const blocks = (blockData.all({ vehicle, from: from_ms, to: to_ms }) as BlockRow[]).map(decode);
    if (blocks.length === 0) return tail;
    const ranges = blocks.map((b) => [lowerBound(b.time_ms, from_ms), lowerBound(b.time_ms, to_ms)] as const);
    const out = emptyColumns(ranges.reduce((n, [lo, hi]) => n + hi - lo, tail.n));
    let r = 0;
    let at = 0;
    blocks.forEach((b, k) => {
      const [lo, hi] = ranges[k]!;
      const r2 = lowerBound(tail.time_ms, b.time_ms[0]!, r);
      copyColumns(tail, r, r2, out, at);
      at += r2 - r;
      r = r2;
      copyColumns(b, lo, hi, out, at);
      at += hi - lo;
    });
    copyColumns(tail, r, tail.n, out, at);
    return out;
  };
}

/** One vehicle's samples sorted by (rounded) time; of several with one time, the last written. */
function sortedUnique(list: readonly Sample[]): SampleColumns {
  const t = Float64Array.from(list, (s) => storedTime(s.time_ms));
  let order: number[] | undefined;
  for (let i = 1; i < t.length; i++)
    if (t[i]! < t[i - 1]!) {
      order = Array.from(t, (_, k) => k).sort((a, b) => t[a]! - t[b]! || a - b);
      break;
    }
  const c = emptyColumns(list.length);
  let n = 0;
  for (let k = 0; k < list.length; k++) {
    const i = order ? order[k]! : k;
    const next = order ? order[k + 1] : k + 1;
    if (next !== undefined && next < list.length && t[next] === t[i]) continue; // a later write follows
    const s = list[i]!;
    c.time_ms[n] = t[i]!;
    for (const name of SIGNAL_NAMES) c[name][n] = s[name] ?? Number.NaN;
    c.trip[n] = s.trip;
    n++;
  }
  return sliceColumns(c, 0, n);
}

/** The rows of `c` in the given index ranges, as one column set. */
function pick(c: SampleColumns, ranges: readonly [number, number][]): SampleColumns {
  const out = emptyColumns(ranges.reduce((n, [lo, hi]) => n + hi - lo, 0));
  let at = 0;
  for (const [lo, hi] of ranges) {
    copyColumns(c, lo, hi, out, at);
    at += hi - lo;
  }
  return out;
}

function rowsToColumns(rows: unknown[][]): SampleColumns {
  const c = emptyColumns(rows.length);
  rows.forEach((row, i) => {
    c.time_ms[i] = row[0] as number;
    c.trip[i] = (row[1] as string | null) ?? undefined;
    for (let j = 0; j < SIGNAL_NAMES.length; j++)
      c[SIGNAL_NAMES[j]!][i] = (row[j + 2] as number | null) ?? Number.NaN;
  });
  return c;
}

function rowToSample(row: Record<string, unknown>): Sample {
  const s: Record<string, unknown> = { time_ms: row.time_ms, vehicle: row.vehicle };
  if (row.trip !== null) s.trip = row.trip;
  for (const n of SIGNAL_NAMES) if (row[n] !== null) s[n] = row[n];
  return s as unknown as Sample;
}
