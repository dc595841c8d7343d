import { writeFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { InputError, type Problem } from '@thermargin/shared';
import { pgnOf } from '@thermargin/logger-data/j1939/identifier';
import { standardPgns } from '@thermargin/logger-data/j1939/config';
import { TP_CM, TP_DT } from '@thermargin/logger-data/j1939/transport';
import { readCandumpFile } from '@thermargin/logger-data/io/candump-file';
import { forEachLine } from '@thermargin/logger-data/io/lines';
import { detectDialect } from '@thermargin/logger-data/table/dialect';
import { type Draft, draftFramesMap, draftTableMap, type PgnSeen } from '@thermargin/logger-data/table/draft';
import { listDataFiles } from '../import/data-files.ts';
import { headerNames, splitCsvLine } from '../import/csv-reader.ts';
import { MAX_LINE_USAGE, maxLineBytes } from '../fleet-data-args.ts';
import { UsageError } from '../usage-error.ts';

export const DRAFT_MAP_USAGE = `thermargin draft-map --data FILE [--out MAP.json] [--rows N] [--max-line-bytes N]
  Reads a logger's file and proposes a mapping file for --map: for a table, its delimiter, decimal mark,
  time column and form, vehicle column, and the column and unit of each signal (by name and plausible
  values); for a candump log, the standard J1939 messages found and the PGNs nothing reads yet. What it
  is unsure of is said on standard error. Edit the draft before use.
  --data  the file to read
  --out   write the draft here instead of to standard output
  --rows  table rows to read (default 500)
${MAX_LINE_USAGE}`;

/** Stops reading a file once enough rows are in (thrown through forEachLine, caught here). */
class Enough extends Error {}

function draftTable(file: string, rows: number, max_line_bytes: number): Draft {
  const lines: string[] = [];
  try {
    forEachLine(
      file,
      (s, a, b) => {
        lines.push(s.toString('latin1', a, b));
        if (lines.length > rows) throw new Enough();
      },
      undefined,
      max_line_bytes,
    );
  } catch (e) {
    if (!(e instanceof Enough)) throw e;
  }
  const [header, ...body] = lines.filter((l) => l.trim() !== '');
  if (header === undefined) throw new InputError([{ where: file, rule: 'empty file (no header row)' }]);
  const dialect = detectDialect(header, body);
  return draftTableMap(
    headerNames(header, dialect.delimiter),
    body.map((l) => splitCsvLine(l, dialect.delimiter)),
    dialect,
    file,
  );
}

function draftFrames(file: string, max_line_bytes: number): Draft {
  const seen = new Map<number, PgnSeen>();
  readCandumpFile(
    file,
    (_t, id, length) => {
      const id29 = id & 0x1fff_ffff;
      const pgn = pgnOf(id29);
      if (pgn === TP_CM || pgn === TP_DT || id29 === id) return;
      const key = pgn * 4096 + (id29 & 0xff) * 16 + length;
      const s = seen.get(key);
      if (s) s.frames++;
      else seen.set(key, { pgn, source: id29 & 0xff, length, frames: 1 });
    },
    () => {},
    undefined,
    max_line_bytes,
  );
  return draftFramesMap([...seen.values()], standardPgns(), file);
}

export async function draftMapCommand(argv: string[], log: (line: string) => void): Promise<void> {
  const { values } = parseArgs({
    args: argv,
    options: {
      data: { type: 'string' },
      out: { type: 'string' },
      rows: { type: 'string' },
      'max-line-bytes': { type: 'string' },
    },
    strict: true,
  });
  const rows = values.rows === undefined ? 500 : Number(values.rows);
  const problems: Problem[] = [];
  const maxLine = maxLineBytes(values, problems);
  if (!values.data) problems.push({ where: '--data', rule: 'required' });
  if (!(Number.isInteger(rows) && rows >= 1))
    problems.push({ where: '--rows', rule: 'must be an integer ≥ 1' });
  if (problems.length) throw new UsageError(problems);
  const { files } = listDataFiles(values.data!);
  if (files.length !== 1)
    throw new UsageError([
      { where: '--data', rule: `${values.data} holds ${files.length} data files: give one of them` },
    ]);
  const file = files[0]!;
  const draft =
    file.kind === 'candump' ? draftFrames(file.path, maxLine) : draftTable(file.path, rows, maxLine);
  const text = `${JSON.stringify(draft.map, null, 2)}\n`;
  if (values.out) writeFileSync(values.out, text);
  else process.stdout.write(text);
  for (const n of draft.notes) log(`check: ${n}`);
  log(
    `drafted a mapping for a ${file.kind === 'candump' ? 'candump log' : 'table'}${values.out ? ` into ${values.out}` : ''}; use it with --map after checking it`,
  );
}
