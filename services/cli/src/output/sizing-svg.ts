/** Small inline SVG charts for the sizing report: no scripts, no external assets, printable. */

/** Escapes text for HTML and SVG. */
export function esc(s: string | number): string {
  return String(s).replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

const COLORS = ['#2b6cb0', '#c05621', '#2f855a', '#6b46c1', '#b7791f'];
const W = 640;
const PAD = { l: 56, r: 12, t: 28, b: 56 };

/** A "nice" upper axis limit and step for values up to `max`. */
function niceAxis(max: number): { top: number; step: number } {
  if (!(max > 0)) return { top: 1, step: 0.25 };
  const raw = max / 4;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * mag).find((s) => s >= raw)!;
  return { top: Math.ceil(max / step) * step, step };
}

function frame(title: string, unit: string, top: number, step: number, plotH: number): string[] {
  const out = [`<text x="${PAD.l}" y="16" font-size="13" font-weight="bold">${esc(title)}</text>`];
  for (let v = 0; v <= top + 1e-9; v += step) {
    const y = PAD.t + plotH - (v / top) * plotH;
    out.push(
      `<line x1="${PAD.l}" x2="${W - PAD.r}" y1="${y}" y2="${y}" stroke="#ddd"/>`,
      `<text x="${PAD.l - 4}" y="${y + 4}" font-size="10" text-anchor="end">${+v.toPrecision(4)}</text>`,
    );
  }
  out.push(
    `<text x="12" y="${PAD.t + plotH / 2}" font-size="10" transform="rotate(-90 12 ${PAD.t + plotH / 2})" text-anchor="middle">${esc(unit)}</text>`,
  );
  return out;
}

export interface BarSeries {
  name: string;
  values: (number | null)[];
}

/** Grouped bars: one group per category, one bar per series; null values leave a gap. */
export function barChart(title: string, unit: string, categories: string[], series: BarSeries[]): string {
  const h = 260;
  const plotH = h - PAD.t - PAD.b;
  const max = Math.max(0, ...series.flatMap((s) => s.values.filter((v): v is number => v !== null)));
  const { top, step } = niceAxis(max);
  const groupW = (W - PAD.l - PAD.r) / Math.max(1, categories.length);
  const barW = (groupW * 0.8) / Math.max(1, series.length);
  const parts = frame(title, unit, top, step, plotH);
  categories.forEach((c, i) => {
    const x0 = PAD.l + i * groupW + groupW * 0.1;
    series.forEach((s, j) => {
      const v = s.values[i];
      if (v === null || v === undefined) return;
      const bh = (v / top) * plotH;
      parts.push(
        `<rect x="${(x0 + j * barW).toFixed(1)}" y="${(PAD.t + plotH - bh).toFixed(1)}" width="${(barW * 0.92).toFixed(1)}" height="${bh.toFixed(1)}" fill="${COLORS[j % COLORS.length]}"><title>${esc(`${c} ${s.name}: ${+v.toPrecision(4)} ${unit}`)}</title></rect>`,
      );
    });
    parts.push(
      `<text x="${(x0 + groupW * 0.4).toFixed(1)}" y="${PAD.t + plotH + 14}" font-size="10" text-anchor="middle">${esc(c)}</text>`,
    );
  });
  series.forEach((s, j) => {
    const x = PAD.l + j * 120;
    parts.push(
      `<rect x="${x}" y="${h - 18}" width="10" height="10" fill="${COLORS[j % COLORS.length]}"/>`,
      `<text x="${x + 14}" y="${h - 9}" font-size="10">${esc(s.name)}</text>`,
    );
  });
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${h}" width="${W}" height="${h}" role="img" aria-label="${esc(title)}">${parts.join('')}</svg>`;
}

export interface DotRow {
  label: string;
  value: number;
  lo: number | null;
  hi: number | null;
}

/** Dots with 95 % whiskers, one row per item, and a dashed reference line (e.g. field ÷ bench = 1). */
export function dotChart(title: string, unit: string, rows: DotRow[], reference: number | null): string {
  const rowH = 18;
  const h = PAD.t + rows.length * rowH + 30;
  const all = rows.flatMap((r) => [r.value, r.lo ?? r.value, r.hi ?? r.value]).concat(reference ?? []);
  const lo = Math.min(...all);
  const hi = Math.max(...all);
  const span = hi - lo || Math.abs(hi) || 1;
  const a = lo - 0.1 * span;
  const b = hi + 0.1 * span;
  const left = 120;
  const x = (v: number) => left + ((v - a) / (b - a)) * (W - left - PAD.r);
  const parts = [`<text x="${left}" y="16" font-size="13" font-weight="bold">${esc(title)}</text>`];
  if (reference !== null)
    parts.push(
      `<line x1="${x(reference)}" x2="${x(reference)}" y1="${PAD.t - 4}" y2="${h - 24}" stroke="#999" stroke-dasharray="4 3"/>`,
    );
  rows.forEach((r, i) => {
    const y = PAD.t + i * rowH + rowH / 2;
    parts.push(`<text x="${left - 6}" y="${y + 4}" font-size="10" text-anchor="end">${esc(r.label)}</text>`);
    if (r.lo !== null && r.hi !== null)
      parts.push(
        `<line x1="${x(r.lo)}" x2="${x(r.hi)}" y1="${y}" y2="${y}" stroke="${COLORS[0]}" stroke-width="2"/>`,
      );
    parts.push(
      `<circle cx="${x(r.value)}" cy="${y}" r="4" fill="${COLORS[1]}"><title>${esc(`${r.label}: ${r.value} ${unit}`)}</title></circle>`,
    );
  });
  for (const v of [a, (a + b) / 2, b])
    parts.push(
      `<text x="${x(v)}" y="${h - 8}" font-size="10" text-anchor="middle">${+v.toPrecision(3)}</text>`,
    );
  parts.push(`<text x="${W - PAD.r}" y="${h - 8}" font-size="10" text-anchor="end">${esc(unit)}</text>`);
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${h}" width="${W}" height="${h}" role="img" aria-label="${esc(title)}">${parts.join('')}</svg>`;
}
