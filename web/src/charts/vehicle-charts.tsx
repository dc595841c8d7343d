import { DAY_MS } from '@thermargin/shared/time';
import type { MaintenanceView } from '@thermargin/shared/api';
import type { HealthSeriesView } from '@thermargin/shared/health-series';
import type { VehicleConfigInput } from '@thermargin/shared/fleet';
import { useMemo } from 'preact/hooks';
import type uPlot from 'uplot';
import { ACTION_WORD, BAND_WORD, num, when } from '../format.ts';
import { Chart, MIN_SPAN, timeAxis, valueAxis } from './Chart.tsx';
import { type Marker, overlays } from './overlays.ts';
import { DASH, INK, SHADE } from './palette.ts';

type Col = (number | null)[];
const pct = (c: Col): Col => c.map((v) => (v === null ? null : v * 100));
const dots = (label: string, stroke: string, shape: 'circle' | 'square' = 'circle'): uPlot.Series => ({
  label,
  stroke,
  width: 0,
  paths: () => null,
  points: {
    show: true,
    size: shape === 'circle' ? 6 : 7,
    fill: shape === 'circle' ? stroke : '#fff',
    stroke,
  },
  value: (_u, v) => num(v, '%'),
});
const line = (label: string, stroke: string, dash: number[], unit: string, scale?: string): uPlot.Series => ({
  label,
  stroke,
  width: 2,
  dash,
  spanGaps: true,
  points: { show: false },
  value: (_u, v) => num(v, unit),
  ...(scale ? { scale } : {}),
});

/** The projected inspection date in words: due since it once the last trip has reached it. */
const projectedInspection = (date: string | null, last_ms: number): string =>
  `${date && Date.parse(date) <= last_ms ? 'inspection due since' : 'projected inspection'} ${when(date, false)}`;

function maintenanceMarkers(entries: readonly MaintenanceView[]): Marker[] {
  return entries.map((m) => ({
    x: Date.parse(m.date.length === 10 ? `${m.date}T00:00:00Z` : m.date),
    label: `⚒ ${ACTION_WORD[m.action]}`,
    color: INK.teal,
    dash: DASH.solid,
  }));
}

/** Health per band (k over its reference, %) with the EWMA control limit, change points and maintenance. */
export function HealthChart({
  s,
  maintenance,
}: {
  s: HealthSeriesView;
  maintenance: readonly MaintenanceView[];
}) {
  const props = useMemo(() => {
    const changes: Marker[] = [
      ...s.ram.change_points.map((c) => ['ram', c] as const),
      ...s.fan.change_points.map((c) => ['fan', c] as const),
    ].map(([band, c]) => ({
      x: Date.parse(c.signal),
      label:
        c.shift_pct === null || c.shift_pct === undefined
          ? `change: ${band} (${c.detector})`
          : `change: ${band} ${c.shift_pct > 0 ? '+' : ''}${num(c.shift_pct, 'pts')} (${c.detector})`,
      color: INK.red,
      dash: DASH.dashed,
    }));
    return {
      data: [
        s.time_ms,
        pct(s.ram.health),
        pct(s.ram.level),
        pct(s.ram.ewma_lcl),
        pct(s.fan.health),
        pct(s.fan.level),
        pct(s.fan.ewma_lcl),
      ] as uPlot.AlignedData,
      series: [
        dots(`${BAND_WORD.ram} health`, INK.blue),
        line(`${BAND_WORD.ram} level`, INK.blue, DASH.solid, '%'),
        line(`${BAND_WORD.ram} lower control limit`, INK.blue, DASH.dotted, '%'),
        dots(`${BAND_WORD.fan} health`, INK.orange, 'square'),
        line(`${BAND_WORD.fan} level`, INK.orange, DASH.long, '%'),
        line(`${BAND_WORD.fan} lower control limit`, INK.orange, DASH.dotted, '%'),
      ],
      axes: [timeAxis(), valueAxis('health: k / reference (%)')],
      plugins: [overlays({ markers: [...changes, ...maintenanceMarkers(maintenance)] })],
    };
  }, [s, maintenance]);
  const latest = (c: Col) =>
    num(
      pct(c).findLast((v) => v !== null),
      '%',
    );
  return (
    <Chart
      id="vehicle-health"
      title="Health per band over time (%, 100 % = as clean)"
      summary={`${s.time_ms.length} trips; latest level ${BAND_WORD.ram} ${latest(s.ram.level)}, ${BAND_WORD.fan} ${latest(s.fan.level)}`}
      empty={`Not enough trips in the ${BAND_WORD.ram} or ${BAND_WORD.fan} band yet: health needs a valid k on a trip.`}
      minSpan={{ y: MIN_SPAN['%'] }}
      {...props}
    />
  );
}

/** Margin (%, left) and limiting ambient temperature (°C, right) per trip, thresholds, and the projection with its interval. */
export function MarginChart({
  s,
  maintenance,
  config,
}: {
  s: HealthSeriesView;
  maintenance: readonly MaintenanceView[];
  config: VehicleConfigInput;
}) {
  const props = useMemo(() => {
    const p = s.projection;
    // The projection is drawn up to its interval's end, at least a week past the last trip.
    const last = s.time_ms.at(-1) ?? 0;
    const until = Math.max(
      last + 7 * DAY_MS,
      Date.parse(p.interval?.[1] ?? '') || 0,
      Date.parse(p.date ?? '') || 0,
    );
    const curve = p.curve.time_ms.filter((t) => t <= until);
    const xs = [...new Set([...s.time_ms, ...curve])].sort((a, b) => a - b);
    const at = (times: readonly number[], values: readonly (number | null)[]) => {
      const m = new Map(times.map((t, i) => [t, values[i] ?? null]));
      return xs.map((x) => m.get(x) ?? null);
    };
    const m = s.margin;
    const route = config.route_max_ambient_c;
    const spans =
      p.interval?.[0] && p.interval[1]
        ? [{ from: Date.parse(p.interval[0]), to: Date.parse(p.interval[1]), color: SHADE.interval }]
        : [];
    const markers: Marker[] = [...maintenanceMarkers(maintenance)];
    if (p.date)
      markers.push({
        x: Date.parse(p.date),
        label: projectedInspection(p.date, last),
        color: INK.violet,
        dash: DASH.dashed,
      });
    // A trip's own margin is a dot; one through the other band's k a hollow square; one that is the
    // governing band's level (the trip gave that band no k) lies on the level line and is not repeated.
    const kind = (i: number) => m.source?.[i] ?? 'trip';
    const own = m.pct.map((v, i) => (kind(i) === 'trip' ? v : null));
    const other = m.pct.map((v, i) => (kind(i) === 'other_band' ? v : null));
    return {
      data: [
        xs,
        at(s.time_ms, own),
        at(s.time_ms, other),
        at(s.time_ms, m.level_pct),
        at(p.curve.time_ms, p.curve.margin_pct),
        at(s.time_ms, m.lat_level_c),
        at(p.curve.time_ms, p.curve.lat_c),
      ] as uPlot.AlignedData,
      series: [
        { ...dots('margin per trip', INK.slate), value: (_u: uPlot, v: number | null) => num(v, '%') },
        {
          ...dots(`margin per trip via the ${m.basis === 'fan' ? 'ram' : 'fan'} band`, INK.slate, 'square'),
          value: (_u: uPlot, v: number | null) => num(v, '%'),
        },
        line('margin level', INK.blue, DASH.solid, '%'),
        line('projected margin', INK.violet, DASH.dashed, '%'),
        line('limiting ambient (level)', INK.orange, DASH.long, '°C', 'degC'),
        line('projected limiting ambient', INK.orange, DASH.dotted, '°C', 'degC'),
      ],
      axes: [
        timeAxis(),
        valueAxis('margin at design point (%)'),
        valueAxis('limiting ambient (°C)', { scale: 'degC', side: 1, grid: { show: false } }),
      ],
      scales: { degC: { auto: true } },
      plugins: [
        overlays({
          spans,
          markers,
          levels: [
            {
              scale: 'y',
              y: m.inspect_below_pct,
              label: `inspect below ${num(m.inspect_below_pct, '%', 0)}`,
              color: INK.red,
            },
            {
              scale: 'y',
              y: m.watch_below_pct,
              label: `watch below ${num(m.watch_below_pct, '%', 0)}`,
              color: INK.amber,
              dash: DASH.dotted,
            },
            ...(route !== undefined
              ? [
                  {
                    scale: 'degC',
                    y: route,
                    label: `route hottest ${num(route, '°C')}`,
                    color: INK.orange,
                    dash: DASH.dotted,
                  },
                ]
              : []),
          ],
        }),
      ],
    };
  }, [s, maintenance, config]);
  const p = s.projection;
  return (
    <Chart
      id="vehicle-margin"
      title="Margin and limiting ambient temperature over time, with the projection"
      summary={`inspect threshold ${num(s.margin.inspect_below_pct, '%', 0)}; ${projectedInspection(p.date, s.time_ms.at(-1) ?? 0)}${p.interval ? ` (interval ${when(p.interval[0], false)} to ${when(p.interval[1], false)})` : ''}`}
      height={260}
      empty="No trip gave a margin at the design point yet: it needs a valid k in the design point's band."
      minSpan={{ y: MIN_SPAN['%'], degC: MIN_SPAN['°C'] }}
      {...props}
    />
  );
}
