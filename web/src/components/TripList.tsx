import type { TripResult } from '@thermargin/shared/results';
import { useState } from 'preact/hooks';
import { BAND_WORD, duration, marginSourceWords, num, when } from '../format.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';
import { Pager } from './Pager.tsx';
import { RowLink } from './RowLink.tsx';
import { Loaded } from './States.tsx';
import { StatusMark } from './StatusMark.tsx';
import { TableHead } from './TableHead.tsx';

const PAGE = 20;

function Rows({ vehicle, trips }: { vehicle: string; trips: readonly TripResult[] }) {
  return (
    <div class="table-wrap">
      <table class="grid">
        <TableHead
          text={['Trip start']}
          figures={[
            'Duration',
            'Distance',
            'Heat mean / p95',
            `k ${BAND_WORD.ram} / ${BAND_WORD.fan} (W/(m²·K))`,
            'Margin',
            'Derate',
          ]}
          after={['Status after trip']}
        />
        <tbody>
          {trips.map((t) => (
            <tr key={t.trip} data-trip={t.trip} class="row-link">
              <td>
                <RowLink to={href.trip(vehicle, t.trip)} label={`Open trip ${t.trip}`}>
                  {when(t.start)}
                </RowLink>
              </td>
              <td class="num">{duration((Date.parse(t.end) - Date.parse(t.start)) / 1000)}</td>
              <td class="num">{num(t.distance_km, 'km')}</td>
              <td class="num">
                {num(t.heat_kw_mean, 'kW')} / {num(t.heat_kw_p95, 'kW')}
              </td>
              <td class="num" title={[t.k_ram_reason, t.k_fan_reason].filter(Boolean).join('; ')}>
                {num(t.k_ram_w_m2k, '', 0)} / {num(t.k_fan_w_m2k, '', 0)}
              </td>
              <td class="num" title={marginSourceWords(t) ?? undefined}>
                {num(t.margin_pct, '%')}
                {t.margin_source === 'band_level' && <span class="muted small"> level</span>}
                {t.margin_source === 'other_band' && <span class="muted small"> via {t.margin_basis}</span>}
              </td>
              <td class="num">{t.derate_s > 0 ? duration(t.derate_s) : 'none'}</td>
              <td>
                {t.status ? (
                  <StatusMark status={t.status} />
                ) : t.too_short ? (
                  <span class="muted" data-too-short>
                    too short to judge
                  </span>
                ) : (
                  '—'
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** A vehicle's trips, newest first: the first page from the vehicle answer, further pages from the trips route. */
export function TripList({
  session,
  vehicle,
  first,
  total,
}: {
  session: Session;
  vehicle: string;
  first: readonly TripResult[];
  total: number;
}) {
  const [page, setPage] = useState(0);
  const pages = Math.max(1, Math.ceil(total / PAGE));
  const res = useResource(
    async () =>
      page === 0
        ? first.slice(0, PAGE)
        : (
            await session.api.call('trips', {
              params: { id: vehicle },
              query: { offset: page * PAGE, limit: PAGE },
            })
          ).trips,
    [page, vehicle, first],
  );
  return (
    <>
      <Loaded res={res} what="trips">
        {(trips) => <Rows vehicle={vehicle} trips={trips} />}
      </Loaded>
      <Pager page={page} pages={pages} total={total} what="trips" onPage={setPage} />
    </>
  );
}
