import { readdirSync, statSync } from 'node:fs';
import { basename, dirname, join, relative, sep } from 'node:path';
import { InputError } from '@thermargin/shared';
import { looksLikeCandump } from '@thermargin/logger-data/candump';
import { readHead } from '@thermargin/logger-data/io/lines';

/** A table (CSV or another delimited text) or a SocketCAN `candump -l` log. */
export interface DataFile {
  path: string;
  kind: 'table' | 'candump';
  bytes: number;
}

/** Names a folder's tables go by; a candump log is recognised by its content, whatever its name. */
const TABLE_NAME = /\.(csv|tsv)$/i;
/** Files a data folder often holds beside the data (notes, the fleet and mapping files): passed over quietly. */
const BESIDE_DATA = /\.(json|md|txt|pdf)$/i;
const HEAD_BYTES = 4096;

/**
 * The data at `path`: the file itself, or every file below the folder in name order that is a candump
 * log (by content) or a table (*.csv, *.tsv). Other files are listed in `skipped`, but for notes,
 * JSON and the like.
 */
export function listDataFiles(path: string): { files: DataFile[]; bytes: number; skipped: string[] } {
  let st: ReturnType<typeof statSync>;
  try {
    st = statSync(path);
  } catch {
    throw new InputError([{ where: path, rule: 'no such file or folder' }], 'data not found');
  }
  const kindOf = (p: string) => (looksLikeCandump(readHead(p, HEAD_BYTES)) ? 'candump' : 'table');
  if (st.isFile())
    return { files: [{ path, kind: kindOf(path), bytes: st.size }], bytes: st.size, skipped: [] };
  const files: DataFile[] = [];
  const skipped: string[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = join(dir, e.name);
      if (e.name.startsWith('.')) continue;
      if (e.isDirectory()) walk(p);
      else if (e.isFile()) {
        const kind = kindOf(p);
        if (kind === 'candump' || TABLE_NAME.test(e.name))
          files.push({ path: p, kind, bytes: statSync(p).size });
        else if (!BESIDE_DATA.test(e.name)) skipped.push(p);
      }
    }
  };
  walk(path);
  if (files.length === 0)
    throw new InputError(
      [{ where: path, rule: 'folder holds no data files (*.csv or *.tsv tables, or candump -l logs)' }],
      'no data',
    );
  return { files, bytes: files.reduce((s, f) => s + f.bytes, 0), skipped };
}

/** Whether `name` is `id`, or starts with it followed by something that cannot continue an id's word. */
const namesId = (name: string, id: string) =>
  name === id || (name.startsWith(id) && !/[A-Za-z0-9]/.test(name[id.length]!));

/**
 * The vehicle a file belongs to by its path: the file's name without extensions, then its folders
 * innermost first up to `root`, each matched against the fleet's ids (the longest id a name starts with,
 * so `van-03_2024-06-01.log` is van-03's). Null when no part of the path names one.
 */
export function vehicleOfPath(file: string, root: string, ids: readonly string[]): string | null {
  const stem = basename(file).replace(/\.[^.]*$/, '');
  const folders = relative(root, dirname(file))
    .split(sep)
    .filter((p) => p && p !== '..')
    .reverse();
  for (const name of [stem, ...folders]) {
    const hit = ids.filter((id) => namesId(name, id)).sort((a, b) => b.length - a.length)[0];
    if (hit) return hit;
  }
  return null;
}
