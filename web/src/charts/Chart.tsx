import { DAY_MS } from '@thermargin/shared/time';
import { useEffect, useRef } from 'preact/hooks';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { ZoomLink } from './link.ts';
import { INK } from './palette.ts';

/** Test and benchmark handle: every mounted chart by id (its uPlot instance holds `data` and `series`). */
declare global {
  interface Window {
    __thermargin?: { charts: Record<string, uPlot> };
  }
}

export interface ChartProps {
  /** Stable id: `data-chart` attribute and window.__thermargin.charts key. */
  id: string;
  title: string;
  /** Said by screen readers in place of the canvas. */
  summary: string;
  data: uPlot.AlignedData;
  series: uPlot.Series[];
  axes: uPlot.Axis[];
  scales?: uPlot.Scales;
  plugins?: uPlot.Plugin[];
  height?: number;
  link?: ZoomLink;
  /** x other than time (UTC epoch ms, the default): its legend series and scale. */
  x?: { series: uPlot.Series; scale: uPlot.Scale };
  /** Shown in place of the plot when no series has a value to draw: why the chart is empty. */
  empty: string;
  /** The least span of a value scale, by scale key (MIN_SPAN by unit): a flat line is not a step. */
  minSpan?: Partial<Record<string, number>>;
}

/**
 * The least span of a value axis per unit: noise of 0.01 K must not fill a chart's height as if it were a
 * step (our choice: about a sensor's resolution times a few, rounded).
 */
export const MIN_SPAN = { K: 4, '°C': 4, '%': 10, kW: 10, 'km/h': 10, 'W/(m²·K)': 200 } as const;

/** [lo, hi] widened about its middle to at least `span`. */
export function atLeast(lo: number | null, hi: number | null, span: number): uPlot.Range.MinMax {
  if (lo === null || hi === null || !Number.isFinite(lo) || !Number.isFinite(hi)) return [0, span];
  const pad = Math.max(0, span - (hi - lo)) / 2;
  return [lo - pad, hi + pad];
}

const hasValues = (data: uPlot.AlignedData) =>
  data
    .slice(1)
    .some((col) => Array.prototype.some.call(col, (v: number | null) => v !== null && Number.isFinite(v)));

const axisStyle = { stroke: INK.axis, grid: { stroke: INK.grid, width: 1 }, ticks: { stroke: INK.grid } };

/** x is epoch ms shown in UTC. */
const utc = (ms: number) => uPlot.tzDate(new Date(ms), 'Etc/UTC');

const pad2 = (n: number) => String(n).padStart(2, '0');

/**
 * Tick labels in 24 h UTC: dates when ticks are a day or more apart; otherwise the clock time, with
 * the date at midnight so a span of days still shows which day each tick is on.
 */
function timeTicks(_u: uPlot, splits: number[]): string[] {
  const step = splits.length > 1 ? splits[1]! - splits[0]! : DAY_MS;
  return splits.map((ms) => {
    const d = new Date(ms);
    const date = `${pad2(d.getUTCMonth() + 1)}-${pad2(d.getUTCDate())}`;
    const time = `${pad2(d.getUTCHours())}:${pad2(d.getUTCMinutes())}`;
    return step >= DAY_MS || ms % DAY_MS === 0 ? date : time;
  });
}

/** A value axis's width in px: its tick labels and its title. */
export const AXIS_SIZE = 56;
export const AXIS_LABEL_SIZE = 20;

export const timeAxis = (label = 'time (UTC)'): uPlot.Axis => ({
  ...axisStyle,
  label,
  labelSize: AXIS_LABEL_SIZE,
  values: timeTicks,
});
export const valueAxis = (label: string, o: Partial<uPlot.Axis> = {}): uPlot.Axis => ({
  ...axisStyle,
  label,
  labelSize: AXIS_LABEL_SIZE,
  size: AXIS_SIZE,
  ...o,
});

/** The scales with a least span where one is asked (a scale with a fixed range keeps it). */
function withMinSpans(scales: uPlot.Scales = {}, spans: Partial<Record<string, number>> = {}): uPlot.Scales {
  const out = { ...scales };
  for (const [key, span] of Object.entries(spans)) {
    const s = out[key];
    if (s?.range || span === undefined) continue;
    out[key] = { ...s, range: (_u, lo, hi) => atLeast(lo, hi, span) };
  }
  return out;
}

/** A uPlot chart that fills its container's width; recreated when its inputs change. */
export function Chart(p: ChartProps) {
  const host = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = host.current;
    if (!el) return;
    const opts: uPlot.Options = {
      width: Math.max(320, el.clientWidth),
      height: p.height ?? 220,
      ms: 1,
      tzDate: utc,
      series: [p.x?.series ?? { label: 'time (UTC)', value: '{YYYY}-{MM}-{DD} {HH}:{mm}:{ss}' }, ...p.series],
      axes: p.axes,
      scales: { x: p.x?.scale ?? { time: true }, ...withMinSpans(p.scales, p.minSpan) },
      plugins: p.plugins ?? [],
      legend: { live: true },
      cursor: p.link
        ? { sync: { key: p.link.key, setSeries: false }, drag: { x: true, y: false } }
        : { drag: { x: true, y: false } },
      hooks: p.link ? { setScale: [p.link.onScale] } : {},
    };
    const u = new uPlot(opts, p.data, el);
    const unlink = p.link?.add(u);
    window.__thermargin ??= { charts: {} };
    window.__thermargin.charts[p.id] = u;
    const resize = new ResizeObserver(() => {
      const w = Math.max(320, el.clientWidth);
      if (Math.abs(w - u.width) > 1) u.setSize({ width: w, height: u.height });
    });
    resize.observe(el);
    return () => {
      resize.disconnect();
      unlink?.();
      if (window.__thermargin?.charts[p.id] === u) delete window.__thermargin.charts[p.id];
      u.destroy();
    };
  }, [p.data, p.series, p.axes, p.scales, p.plugins, p.link, p.id, p.height, p.x, p.minSpan]);
  if (!hasValues(p.data))
    return (
      <figure class="chart chart-empty" data-chart={p.id} data-points={0}>
        <figcaption>{p.title}</figcaption>
        <p class="state state-empty" data-empty>
          {p.empty}
        </p>
      </figure>
    );
  return (
    <figure class="chart" data-chart={p.id} data-points={p.data[0].length}>
      <figcaption>{p.title}</figcaption>
      <div ref={host} role="img" aria-label={`${p.title}: ${p.summary}`} />
    </figure>
  );
}
