/**
 * A table's header row: text columns, then right-aligned figure columns, then any text columns that
 * close the row (a status, say) — the layout of every figure table.
 */
export function TableHead({
  text,
  figures,
  after = [],
}: {
  text: readonly string[];
  figures: readonly string[];
  after?: readonly string[];
}) {
  const plain = (t: string) => (
    <th key={t} scope="col">
      {t}
    </th>
  );
  return (
    <thead>
      <tr>
        {text.map(plain)}
        {figures.map((t) => (
          <th key={t} scope="col" class="num">
            {t}
          </th>
        ))}
        {after.map(plain)}
      </tr>
    </thead>
  );
}
