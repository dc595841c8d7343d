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
}

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
      scales: { x: p.x?.scale ?? { time: true }, ...p.scales },
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
  }, [p.data, p.series, p.axes, p.scales, p.plugins, p.link, p.id, p.height, p.x]);
  return (
    <figure class="chart" data-chart={p.id} data-points={p.data[0].length}>
      <figcaption>{p.title}</figcaption>
      <div ref={host} role="img" aria-label={`${p.title}: ${p.summary}`} />
    </figure>
  );
}
