import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '@thermargin/shared';

/** The CSV files at `path`: the file itself, or every *.csv below the folder, in name order. */
export function listCsvFiles(path: string): { files: string[]; bytes: number } {
  let st: ReturnType<typeof statSync>;
  try {
    st = statSync(path);
  } catch {
    throw new InputError([{ where: path, rule: 'no such file or folder' }], 'data not found');
  }
  if (st.isFile()) return { files: [path], bytes: st.size };
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.isFile() && e.name.toLowerCase().endsWith('.csv')) files.push(p);
    }
  };
  walk(path);
  if (files.length === 0)
    throw new InputError([{ where: path, rule: 'folder holds no .csv files' }], 'no data');
  return { files, bytes: files.reduce((s, f) => s + statSync(f).size, 0) };
}
