import type { TraceResponse } from '@thermargin/shared/api';
import { useEffect, useMemo } from 'preact/hooks';
import { ZoomLink } from '../charts/link.ts';
import { TripCharts } from '../charts/trip-charts.tsx';
import { Loaded } from '../components/States.tsx';
import { StatusMark } from '../components/StatusMark.tsx';
import { BAND_WORD, duration, marginSourceWords, num, when } from '../format.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';
import { Figure } from '../components/Figure.tsx';

const ci = (c: [number, number] | null) => (c ? ` (95 % CI ${num(c[0], '', 0)}…${num(c[1], '', 0)})` : '');

function TripFigures({ t }: { t: TraceResponse['trip'] }) {
  const rows: [string, string, string][] = [
    ['start', 'Start', when(t.start)],
    ['duration', 'Duration', duration((Date.parse(t.end) - Date.parse(t.start)) / 1000)],
    ['distance', 'Distance', num(t.distance_km, 'km')],
    [
      'heat',
      'Heat into coolant mean / p95 / max',
      `${num(t.heat_kw_mean, 'kW')} / ${num(t.heat_kw_p95, 'kW')} / ${num(t.heat_kw_max, 'kW')}`,
    ],
    ['energy', 'Heat energy', num(t.heat_kwh, 'kWh')],
    [
      'k-ram',
      `k ${BAND_WORD.ram} (${t.n_ram} windows)`,
      t.k_ram_w_m2k === null
        ? (t.k_ram_reason ?? '—')
        : `${num(t.k_ram_w_m2k, 'W/m²·K', 0)}${ci(t.k_ram_ci95)}`,
    ],
    [
      'k-fan',
      `k ${BAND_WORD.fan} (${t.n_fan} windows)`,
      t.k_fan_w_m2k === null
        ? (t.k_fan_reason ?? '—')
        : `${num(t.k_fan_w_m2k, 'W/m²·K', 0)}${ci(t.k_fan_ci95)}`,
    ],
    [
      'margin',
      'Margin at design point',
      `${num(t.margin_pct, '%')}${marginSourceWords(t) ? ` (${marginSourceWords(t)})` : ''}`,
    ],
    ['lat', 'Limiting ambient', num(t.limiting_ambient_c, '°C')],
    [
      'coolant-max',
      'Coolant max / ambient max',
      `${num(t.coolant_max_c, '°C')} / ${num(t.ambient_max_c, '°C')}`,
    ],
    ['derate', 'Derate time', t.derate_s > 0 ? duration(t.derate_s) : 'none'],
    ['rejected', 'Samples / rejected', `${t.samples} / ${t.rejected}`],
  ];
  return (
    <dl class="figures">
      {rows.map(([k, label, value]) => (
        <Figure key={k} label={label} fig={k}>
          {value}
        </Figure>
      ))}
      <Figure label="Status after trip">{t.status ? <StatusMark status={t.status} /> : '—'}</Figure>
    </dl>
  );
}

function Body({ trace }: { trace: TraceResponse }) {
  const link = useMemo(() => new ZoomLink(`trip-${trace.vehicle}-${trace.trip.trip}`), [trace]);
  useEffect(() => {
    performance.mark('trip:rendered');
  }, [trace]);
  const t = trace.trip;
  return (
    <>
      <h1>
        Trip trace: {trace.vehicle} · {t.trip}
      </h1>
      <TripFigures t={t} />
      {t.sensor_flags.length > 0 && (
        <p class="state state-empty">Sensor flags: {t.sensor_flags.join('; ')}</p>
      )}
      <div class="toolbar">
        <p class="small muted">
          {trace.points} points shown of {trace.samples} samples (largest-triangle downsampling). Drag across
          a chart to zoom all of them; shaded spans are derate.
        </p>
        <button type="button" class="btn" onClick={() => link.reset()}>
          Reset zoom
        </button>
      </div>
      <TripCharts trace={trace} link={link} />
    </>
  );
}

/** Trip trace: one trip's signals, heat balance, per-sample k and band membership, on linked charts. */
export function TripTrace({
  session,
  id,
  trip,
  points,
}: {
  session: Session;
  id: string;
  trip: string;
  points: number;
}) {
  const res = useResource(
    () => session.api.call('trace', { params: { id, trip }, query: { points } }),
    [session, id, trip, points],
  );
  return (
    <div class="screen" data-screen="trip">
      <nav class="crumbs" aria-label="Breadcrumb">
        <a href={href.fleet()}>Margin overview</a> › <a href={href.vehicle(id)}>{id}</a> › {trip}
      </nav>
      <Loaded res={res} what={`trip ${trip}`}>
        {(t) => <Body trace={t} />}
      </Loaded>
    </div>
  );
}
