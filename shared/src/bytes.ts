/** A byte count as a reader says it: "980 B", "12.3 kB", "2.78 MB" (SI prefixes, 1 kB = 1000 B). */
export function bytesText(n: number): string {
  if (!Number.isFinite(n)) return '—';
  if (Math.abs(n) < 1000) return `${Math.round(n)} B`;
  const [unit, size] = Math.abs(n) < 1e6 ? ['kB', 1e3] : Math.abs(n) < 1e9 ? ['MB', 1e6] : ['GB', 1e9];
  return `${(n / size).toPrecision(3)} ${unit}`;
}
