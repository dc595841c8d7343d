import type { ComponentChildren } from 'preact';

/** A column header that sorts its table; aria-sort tells which column and direction. */
export function SortHeader<K extends string>({
  k,
  sort,
  descending,
  onSort,
  children,
  numeric = false,
}: {
  k: K;
  sort: K;
  descending: boolean;
  onSort: (k: K) => void;
  children: ComponentChildren;
  numeric?: boolean;
}) {
  const active = k === sort;
  return (
    <th
      scope="col"
      class={numeric ? 'num' : undefined}
      aria-sort={active ? (descending ? 'descending' : 'ascending') : 'none'}
    >
      <button type="button" class="th-sort" onClick={() => onSort(k)}>
        {children}
        <span aria-hidden="true" class="sort-arrow">
          {active ? (descending ? '▼' : '▲') : '↕'}
        </span>
      </button>
    </th>
  );
}
