import type { SampleSink } from '../resample.ts';
import type { DecoderConfig } from '../j1939/config.ts';
import { type FrameCounts, FrameDecoder } from '../j1939/decoder.ts';
import { type CandumpFileCounts, readCandumpFile } from './candump-file.ts';

export interface CandumpRead {
  file: CandumpFileCounts;
  frames: FrameCounts;
  /** Frames per PGN nothing reads, most frequent first. */
  unknown_pgns: [number, number][];
}

/**
 * A `candump -l` log → samples: each frame decoded (J1939) into the resampler, each sample to `sink`
 * (values in NUMERIC_COLUMNS order, valid only during the call). Unusable lines and undecodable frames
 * go to `bad` with file:line and the rule.
 */
export function candumpSamples(
  file: string,
  config: DecoderConfig,
  sink: SampleSink,
  bad: (where: string, reason: string, detail: string) => void,
  onBytes?: (n: number) => void,
  max_line_bytes?: number,
): CandumpRead {
  let line = 0;
  const decoder = new FrameDecoder(config, sink, (reason, detail) => bad(`${file}:${line}`, reason, detail));
  const counts = readCandumpFile(
    file,
    (t, id, len, bytes, at, n) => {
      line = n;
      decoder.frame(t, id, len, bytes, at);
    },
    bad,
    onBytes,
    max_line_bytes,
  );
  decoder.finish();
  return {
    file: counts,
    frames: decoder.counts,
    unknown_pgns: [...decoder.unknownPgns].sort((a, b) => b[1] - a[1]),
  };
}
