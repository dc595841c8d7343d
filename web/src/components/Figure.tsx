import type { ComponentChildren } from 'preact';

/** One labelled figure of a `dl.figures` list; `fig` names it for tests and links (data-fig). */
export function Figure({
  label,
  fig,
  children,
}: {
  label: string;
  fig?: string;
  children: ComponentChildren;
}) {
  return (
    <div>
      <dt>{label}</dt>
      <dd data-fig={fig}>{children}</dd>
    </div>
  );
}
