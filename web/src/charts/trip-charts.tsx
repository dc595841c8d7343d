import type { TraceColumn, TraceResponse } from '@thermargin/shared/api';
import { useMemo } from 'preact/hooks';
import type uPlot from 'uplot';
import { BAND_WORD, num } from '../format.ts';
import {
  AXIS_LABEL_SIZE,
  AXIS_SIZE,
  atLeast,
  Chart,
  type ChartProps,
  MIN_SPAN,
  timeAxis,
  valueAxis,
} from './Chart.tsx';
import type { ZoomLink } from './link.ts';
import { overlays, runs } from './overlays.ts';
import { DASH, INK, SHADE } from './palette.ts';

type Col = (number | null)[];

/** The trace's columns by name (the API names its columns; their order is not assumed). */
export function traceColumns(t: TraceResponse): Record<TraceColumn, Col> {
  const out = {} as Record<TraceColumn, Col>;
  t.columns.forEach((name, j) => {
    out[name] = t.data[j] ?? [];
  });
  return out;
}

const s = (label: string, stroke: string, unit: string, o: Partial<uPlot.Series> = {}): uPlot.Series => ({
  label,
  stroke,
  width: 1.5,
  points: { show: false },
  value: (_u, v) => num(v, unit),
  ...o,
});

/** A lane drawn as a thick bar where the flag is 1: which samples counted for a band. */
const lane = (flag: Col, at: number): Col => flag.map((f) => (f === 1 ? at : null));

/** Every trip chart's left axis is this wide, so the plots line up under one another. */
const LEFT_SIZE = 64;
const left = (label: string, o: Partial<uPlot.Axis> = {}) => valueAxis(label, { size: LEFT_SIZE, ...o });
/** An empty right axis as wide as the power axis, for the charts that have none. */
const RIGHT_SPACER: uPlot.Axis = {
  side: 1,
  size: AXIS_SIZE + AXIS_LABEL_SIZE,
  values: () => [],
  grid: { show: false },
  ticks: { show: false },
};

/** One trip chart before the shared parts are added; `extra`: plugins besides the derate shading. */
type TripChart = Omit<ChartProps, 'link' | 'summary' | 'data' | 'plugins'> & {
  data: Col[];
  extra?: uPlot.Plugin[];
};

/** Keeps only the series whose column has a value: the legend lists the signals the vehicle has. */
function measured(data: Col[], series: uPlot.Series[]): { data: Col[]; series: uPlot.Series[] } {
  const keep = series.map((_, i) => data[i + 1]!.some((v) => v !== null));
  return {
    data: [data[0]!, ...data.slice(1).filter((_, i) => keep[i])],
    series: series.filter((_, i) => keep[i]),
  };
}

/**
 * The trip's synchronised charts, aligned on one time axis; derate intervals shaded on each, the
 * coolant limit drawn on the temperatures.
 */
export function TripCharts({ trace, link }: { trace: TraceResponse; link: ZoomLink }) {
  const charts = useMemo(() => {
    const c = traceColumns(trace);
    const x = c.time_ms as number[];
    const derate = overlays({
      spans: runs(x, c.derate).map(([from, to]) => ({ from, to, color: SHADE.derate })),
    });
    const limit = trace.coolant_limit_c;
    const limitLine = overlays({
      levels: [{ scale: 'y', y: limit, label: `coolant limit ${num(limit, '°C', 0)}`, color: INK.red }],
    });
    const t = timeAxis();
    const specs: TripChart[] = [
      {
        id: 'trip-speed-power',
        title: 'Speed (km/h) and power (kW)',
        ...measured(
          [x, c.speed_kmh, c.power_kw],
          [s('speed', INK.blue, 'km/h'), s('power', INK.orange, 'kW', { scale: 'kW', dash: DASH.long })],
        ),
        empty: 'No speed or power samples in this trip.',
        minSpan: { y: MIN_SPAN['km/h'], kW: MIN_SPAN.kW },
        axes: [
          t,
          left('speed (km/h)'),
          valueAxis('power (kW)', { scale: 'kW', side: 1, grid: { show: false } }),
        ],
      },
      {
        id: 'trip-temperatures',
        title: 'Coolant in / out and ambient (°C), with the coolant limit',
        ...measured(
          [x, c.coolant_in_c, c.coolant_out_c, c.ambient_c],
          [
            s('coolant in', INK.red, '°C'),
            s('coolant out', INK.blue, '°C', { dash: DASH.long }),
            s('ambient', INK.slate, '°C', { dash: DASH.dotted }),
          ],
        ),
        empty: 'No temperature samples in this trip.',
        // The limit stays in view, with room above it for its label.
        scales: {
          y: {
            range: (_u: uPlot, lo: number | null, hi: number | null) =>
              atLeast(Math.min(lo ?? limit, limit), Math.max(hi ?? limit, limit + 3), MIN_SPAN['°C']),
          },
        },
        extra: [limitLine],
        axes: [t, left('temperature (°C)')],
      },
      {
        id: 'trip-fan',
        title: 'Fan duty (%)',
        data: [x, c.fan_pct],
        series: [s('fan duty', INK.teal, '%', { fill: 'rgba(15, 123, 108, 0.12)' })],
        empty: 'No fan duty samples in this trip.',
        axes: [t, left('fan duty (%)')],
        scales: { y: { range: [0, 100] as uPlot.Range.MinMax } },
        height: 150,
      },
      {
        id: 'trip-heat',
        title: 'Heat generated vs heat rejected (kW)',
        data: [x, c.heat_generated_kw, c.heat_rejected_kw],
        series: [
          s('heat generated', INK.orange, 'kW'),
          s('heat rejected', INK.violet, 'kW', { dash: DASH.long, width: 2 }),
        ],
        empty: 'No heat figures: the trip has no power samples.',
        minSpan: { y: MIN_SPAN.kW },
        axes: [t, left('heat (kW)')],
      },
      {
        id: 'trip-k',
        title: 'k of the valid window each sample belongs to (W/m²·K)',
        data: [x, c.k_w_m2k],
        series: [s('k', INK.blue, 'W/m²·K', { width: 2 })],
        empty: 'No valid window in this trip: k was not estimated (see the reasons above).',
        minSpan: { y: MIN_SPAN['W/(m²·K)'] },
        axes: [t, left('k (W/m²·K)')],
        height: 170,
      },
      {
        id: 'trip-bands',
        title: `Samples that counted for ${BAND_WORD.ram} and ${BAND_WORD.fan}`,
        data: [x, lane(c.counted_ram, 2), lane(c.counted_fan, 1)],
        series: [
          s(`counted for ${BAND_WORD.ram}`, INK.blue, '', {
            width: 10,
            value: (_u, v) => (v === null ? 'no' : 'yes'),
          }),
          s(`counted for ${BAND_WORD.fan}`, INK.orange, '', {
            width: 10,
            value: (_u, v) => (v === null ? 'no' : 'yes'),
          }),
        ],
        axes: [
          t,
          left('band', {
            splits: () => [1, 2],
            values: (_u, v) => v.map((y) => (y === 2 ? BAND_WORD.ram : y === 1 ? BAND_WORD.fan : '')),
          }),
        ],
        scales: { y: { range: [0.4, 2.6] as uPlot.Range.MinMax } },
        empty: `No sample counted for ${BAND_WORD.ram} or ${BAND_WORD.fan} on this trip.`,
        height: 150,
      },
    ];
    return specs.map(({ extra, ...ch }) => ({
      ...ch,
      axes: ch.axes.length === 2 ? [...ch.axes, RIGHT_SPACER] : ch.axes,
      data: ch.data as uPlot.AlignedData,
      plugins: [derate, ...(extra ?? [])],
    }));
  }, [trace]);
  const n = trace.points;
  return (
    <div class="charts">
      {charts.map((ch) => (
        <Chart key={ch.id} {...ch} link={link} summary={`${n} points of ${trace.samples} samples`} />
      ))}
    </div>
  );
}
