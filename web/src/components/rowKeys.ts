/** Props that make a table row open `to` on click, Enter or Space (rows are in the tab order). */
export function rowLink(to: string, label: string) {
  const open = () => {
    location.hash = to;
  };
  return {
    tabIndex: 0,
    class: 'row-link',
    title: label,
    onClick: open,
    onKeyDown: (e: KeyboardEvent) => {
      if (e.target !== e.currentTarget) return;
      if (e.key === 'Enter' || e.key === ' ') {
        e.preventDefault();
        open();
      }
    },
  };
}
