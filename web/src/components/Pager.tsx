/** Page buttons for long lists; says where the reader is in words. */
export function Pager({
  page,
  pages,
  total,
  what,
  onPage,
}: {
  page: number;
  pages: number;
  total: number;
  what: string;
  onPage: (p: number) => void;
}) {
  if (pages <= 1) return <p class="muted pager-info">{`${total} ${what}`}</p>;
  return (
    <nav class="pager" aria-label={`${what} pages`}>
      <button type="button" class="btn" disabled={page === 0} onClick={() => onPage(page - 1)}>
        ← Previous
      </button>
      <span class="pager-info">
        Page {page + 1} of {pages} · {total} {what}
      </span>
      <button type="button" class="btn" disabled={page >= pages - 1} onClick={() => onPage(page + 1)}>
        Next →
      </button>
    </nav>
  );
}
