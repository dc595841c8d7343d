/** How a delimited text table is written: field delimiter and decimal mark. */
export interface Dialect {
  delimiter: ',' | ';' | '\t';
  decimal: '.' | ',';
}

/** Occurrences of `ch` outside double quotes. */
function countOutsideQuotes(line: string, ch: string): number {
  let n = 0;
  let quoted = false;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (c === ch && !quoted) n++;
  }
  return n;
}

const COMMA_DECIMAL = /^\s*[-+]?\d+,\d+\s*$/;
const POINT_DECIMAL = /^\s*[-+]?\d+\.\d+\s*$/;

/**
 * The dialect of a table from its header and first rows: the delimiter among `,` `;` and tab that splits
 * the header most often (a comma only if nothing else does, since it may be a decimal mark), then a
 * decimal comma when the delimiter is not a comma and the rows' numbers are written `12,5` and never `12.5`.
 * What the mapping file states wins over what is detected.
 */
export function detectDialect(
  header: string,
  rows: readonly string[],
  stated: Partial<Dialect> = {},
): Dialect {
  const counts = {
    ';': countOutsideQuotes(header, ';'),
    '\t': countOutsideQuotes(header, '\t'),
    ',': countOutsideQuotes(header, ','),
  };
  const delimiter =
    stated.delimiter ??
    (counts[';'] > 0 || counts['\t'] > 0 ? (counts[';'] >= counts['\t'] ? ';' : '\t') : ',');
  if (stated.decimal) return { delimiter, decimal: stated.decimal };
  if (delimiter === ',') return { delimiter, decimal: '.' };
  let comma = 0;
  let point = 0;
  for (const row of rows)
    for (const field of row.split(delimiter)) {
      if (COMMA_DECIMAL.test(field)) comma++;
      else if (POINT_DECIMAL.test(field)) point++;
    }
  return { delimiter, decimal: comma > 0 && point === 0 ? ',' : '.' };
}
