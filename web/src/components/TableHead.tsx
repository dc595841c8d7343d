/** A table's header row: text columns first, then right-aligned figure columns (the layout of every figure table). */
export function TableHead({ text, figures }: { text: readonly string[]; figures: readonly string[] }) {
  return (
    <thead>
      <tr>
        {text.map((t) => (
          <th key={t} scope="col">
            {t}
          </th>
        ))}
        {figures.map((t) => (
          <th key={t} scope="col" class="num">
            {t}
          </th>
        ))}
      </tr>
    </thead>
  );
}
