import { CAN_EXTENDED, NUMERIC_COLUMNS, type FramesMap } from '@thermargin/shared';
import { compileFrames } from '@thermargin/logger-data/j1939/config';
import { FrameDecoder } from '@thermargin/logger-data/j1939/decoder';
import { j1939Id } from '@thermargin/logger-data/j1939/identifier';

/** A hand-made frame: time in seconds, J1939 parts, data as hex ("7DFFFFFFFFFFFFFF"). */
export interface TestFrame {
  t_s: number;
  pgn: number;
  data: string;
  source?: number;
  priority?: number;
  destination?: number;
}

export const bytesOf = (hex: string) =>
  Uint8Array.from(hex.match(/../g) ?? [], (h) => Number.parseInt(h, 16));

export function idOf(f: Pick<TestFrame, 'pgn' | 'source' | 'priority' | 'destination'>): number {
  return (j1939Id(f.priority ?? 6, f.pgn, f.source ?? 0, f.destination) | CAN_EXTENDED) >>> 0;
}

export type Row = Record<(typeof NUMERIC_COLUMNS)[number], number>;

/** Decodes the frames (in order) with the mapping's frames section; returns the samples and the decoder. */
export function decode(
  frames: readonly TestFrame[],
  map?: FramesMap,
  reference_torque_nm: number | null = null,
) {
  const { config, problems } = compileFrames(map, reference_torque_nm);
  if (problems.length) throw new Error(JSON.stringify(problems));
  const rows: Row[] = [];
  const complaints: string[] = [];
  const d = new FrameDecoder(
    config,
    (v) => rows.push(Object.fromEntries(NUMERIC_COLUMNS.map((c, i) => [c, v[i]!])) as Row),
    (reason, detail) => complaints.push(`${reason}: ${detail}`),
  );
  for (const f of frames) {
    const data = bytesOf(f.data);
    d.frame(Math.round(f.t_s * 1e6), idOf(f), data.length, data, 0);
  }
  d.finish();
  return { rows, decoder: d, complaints };
}
