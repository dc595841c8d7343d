import type { DutyCycleView } from '@thermargin/shared/sizing-api';
import { useMemo } from 'preact/hooks';
import type uPlot from 'uplot';
import { num } from '../format.ts';
import { Chart, valueAxis } from './Chart.tsx';
import { DASH, INK } from './palette.ts';

const PERCENTILE_INK = [INK.teal, INK.blue, INK.orange, INK.red, INK.violet];
const PERCENTILE_DASH = [DASH.dotted, DASH.dashed, DASH.long, DASH.solid, DASH.solid];

/**
 * Heat into the coolant by band (x: the bands in order, labelled): one line per percentile, and the
 * hours driven in each band on the right-hand scale. `by`: speed or ambient bands.
 */
export function DutyChart({ duty, by }: { duty: DutyCycleView; by: 'speed' | 'ambient' }) {
  const props = useMemo(() => {
    const bands = by === 'speed' ? duty.by_speed : duty.by_ambient;
    const xLabel = by === 'speed' ? 'speed band' : 'ambient band';
    const keys = Object.keys(duty.overall.heat_kw ?? {});
    const label = (i: number) => bands[Math.round(i)]?.label ?? '';
    const series: uPlot.Series[] = [
      ...keys.map((k, j) => ({
        label: `heat ${k}`,
        stroke: PERCENTILE_INK[j % PERCENTILE_INK.length]!,
        dash: PERCENTILE_DASH[j % PERCENTILE_DASH.length]!,
        width: 2,
        spanGaps: true,
        points: { show: true, size: 6 },
        value: (_u: uPlot, v: number | null) => num(v, 'kW'),
      })),
      {
        label: 'hours driven',
        stroke: INK.slate,
        width: 1,
        dash: DASH.dotted,
        scale: 'h',
        points: { show: true, size: 5, fill: '#fff' },
        value: (_u: uPlot, v: number | null) => num(v, 'h'),
      },
    ];
    const data: uPlot.AlignedData = [
      bands.map((_, i) => i),
      ...keys.map((k) => bands.map((b) => b.heat_kw?.[k] ?? null)),
      bands.map((b) => b.hours),
    ];
    const axes: uPlot.Axis[] = [
      valueAxis(xLabel, {
        size: 40,
        splits: () => bands.map((_, i) => i),
        values: (_u, splits) => splits.map(label),
      }),
      valueAxis('heat into coolant (kW)'),
      valueAxis('hours', { scale: 'h', side: 1, grid: { show: false } }),
    ];
    return {
      data,
      series,
      axes,
      x: {
        series: {
          label: xLabel,
          value: (_u: uPlot, i: number) => label(i),
        },
        scale: { time: false, range: [-0.3, bands.length - 0.7] as uPlot.Range.MinMax },
      },
      summary: bands
        .map((b) => `${b.label}: ${b.hours} h, p95 ${num(b.heat_kw?.p95 ?? null, 'kW')}`)
        .join('; '),
    };
  }, [duty, by]);
  return (
    <Chart
      id={`sizing-duty-${by}`}
      title={`Heat into the coolant by ${by} band (percentiles of time driven)`}
      summary={props.summary}
      data={props.data}
      series={props.series}
      axes={props.axes}
      x={props.x}
      empty="No driving recorded in any band yet."
      height={240}
    />
  );
}
