import type { ComponentChildren } from 'preact';

/**
 * The link that opens a table row's vehicle or trip: a real anchor (middle-click opens a new tab, the
 * context menu copies the address), stretched over its row by CSS so a click anywhere on the row follows
 * it. The row gets `class="row-link"`.
 */
export function RowLink({ to, label, children }: { to: string; label: string; children: ComponentChildren }) {
  return (
    <a class="row-open" href={to} title={label}>
      {children}
    </a>
  );
}
