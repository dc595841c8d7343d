import type { GroupSizingView, SizingResponse, SizingResultView } from '@thermargin/shared/sizing-api';
import { DutyChart } from '../charts/duty-charts.tsx';
import { AirsideTable } from '../components/AirsideTable.tsx';
import { Caution, DesignNote } from '../components/Caution.tsx';
import { DesignChecks, FoulingNotes } from '../components/DesignChecks.tsx';
import { SizingCalculator } from '../components/SizingCalculator.tsx';
import { Empty, Loaded } from '../components/States.tsx';
import { BAND_WORD, num, POWERTRAIN_WORD, when } from '../format.ts';
import { useLive } from '../state/live.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';
import { TableHead } from '../components/TableHead.tsx';
import { Figure } from '../components/Figure.tsx';

type Spread = GroupSizingView['field_k'][number]['ratio'];

const range = (ci: [number, number] | null, unit: string, digits: number) =>
  ci ? `${num(ci[0], '', digits)} … ${num(ci[1], unit, digits)}` : '—';
/** Median with the middle half across vehicles. */
function spread(s: Spread, unit: string, digits = 1) {
  if (!s) return '—';
  return (
    <>
      {num(s.median, unit, digits)}
      {s.vehicles > 1 && (
        <span class="small muted">
          {' '}
          ({num(s.p25, '', digits)} … {num(s.p75, '', digits)}, {s.vehicles} vehicles)
        </span>
      )}
    </>
  );
}

function FieldK({ s }: { s: SizingResultView }) {
  return (
    <div class="table-wrap">
      <table class="grid" data-table="field-k">
        <TableHead
          text={['Vehicle', 'Band']}
          figures={[
            'Trips',
            'Field k (95 % interval)',
            'Bench k',
            'Field ÷ bench (95 % interval)',
            'Clean ÷ bench',
          ]}
        />
        <tbody>
          {s.vehicles.flatMap((v) =>
            v.field_k.map((k) => (
              <tr key={`${v.id}:${k.band}`} data-vehicle={v.id} data-band={k.band}>
                <th scope="row">
                  <a href={href.vehicle(v.id)}>{v.id}</a> <span class="small muted">{v.type}</span>
                </th>
                <td>{BAND_WORD[k.band]}</td>
                <td class="num">{k.trips}</td>
                <td class="num" data-col="k">
                  {num(k.k_w_m2k, 'W/(m²·K)', 0)}
                  <div class="small muted">{range(k.k_ci95, '', 0)}</div>
                </td>
                <td class="num">{num(k.bench_k_w_m2k, 'W/(m²·K)', 0)}</td>
                <td class="num" data-col="ratio">
                  {num(k.ratio, '', 3)}
                  <div class="small muted">{range(k.ratio_ci95, '', 3)}</div>
                </td>
                <td class="num">{num(k.clean_ratio, '', 3)}</td>
              </tr>
            )),
          )}
          {s.fleet.field_k.map((k) => (
            <tr key={`fleet:${k.band}`} data-vehicle="fleet" data-band={k.band} class="total">
              <th scope="row">Fleet</th>
              <td>{BAND_WORD[k.band]}</td>
              <td />
              <td class="num">{spread(k.k_w_m2k, 'W/(m²·K)', 0)}</td>
              <td />
              <td class="num" data-col="ratio">
                {spread(k.ratio, '', 3)}
              </td>
              <td class="num">{spread(k.clean_ratio, '', 3)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Fouling({ s, caution }: { s: SizingResultView; caution: string }) {
  const groups = [...s.types, s.fleet];
  return (
    <>
      <div class="table-wrap">
        <table class="grid" data-table="fouling">
          <TableHead
            text={['Group', 'Band']}
            figures={[
              'k lost per month',
              'k lost per 1000 km',
              'Days from cleaning to inspection',
              `Fouling allowance for ${s.options.cleaning_interval_days} d`,
            ]}
          />
          <tbody>
            {groups.flatMap((g) =>
              g.fouling.map((f) => (
                <tr key={`${g.group}:${f.band}`} data-group={g.group} data-band={f.band}>
                  <th scope="row">{g.group === 'fleet' ? 'Fleet' : g.group}</th>
                  <td>{BAND_WORD[f.band]}</td>
                  <td class="num" data-col="per-month">
                    {spread(f.loss_pct_per_month, '%', 2)}
                  </td>
                  <td class="num">{spread(f.loss_pct_per_1000km, '%', 2)}</td>
                  <td class="num" data-col="days">
                    {spread(f.days_to_inspect, 'd', 0)}
                  </td>
                  <td class="num">{spread(percent(f.fouling_allowance), '%', 1)}</td>
                </tr>
              )),
            )}
          </tbody>
        </table>
      </div>
      <p class="small muted">
        From the health trend fits between cleanings (at least {s.options.min_fouling_trips} trips over{' '}
        {s.options.min_fouling_span_days} days). The cleaning interval is the time from a cleaning to the
        inspection threshold at the fitted rate. Trips after a fan fault, a coolant-side loss or a suspect
        sensor is named are left out: what they lose is not fouling.
      </p>
      <FoulingNotes s={s} />
      <Caution text={caution} />
    </>
  );
}

/** A spread of shares (0.15) as percent (15). */
const percent = (x: Spread): Spread =>
  x && {
    ...x,
    min: x.min * 100,
    p25: x.p25 * 100,
    median: x.median * 100,
    p75: x.p75 * 100,
    max: x.max * 100,
  };

function Derates({ s }: { s: SizingResultView }) {
  const fleet = s.fleet.derate;
  if (!fleet) return <Empty>No samples were read: derate figures need the stored samples.</Empty>;
  return (
    <div class="table-wrap">
      <table class="grid" data-table="derates">
        <TableHead
          text={['Vehicle']}
          figures={[
            'Events',
            'Hours derated',
            'Share of driving',
            'Energy not delivered',
            'Heat at onset (p50 / p95)',
          ]}
        />
        <tbody>
          {s.vehicles.map((v) => (
            <tr key={v.id} data-vehicle={v.id}>
              <th scope="row">
                <a href={href.vehicle(v.id)}>{v.id}</a>{' '}
                <span class="small muted">{POWERTRAIN_WORD[v.powertrain]}</span>
              </th>
              <td class="num" data-col="events">
                {v.derate?.events ?? '—'}
              </td>
              <td class="num">{num(v.derate?.hours, 'h', 2)}</td>
              <td class="num">{num((v.derate?.share_of_time ?? Number.NaN) * 100, '%', 2)}</td>
              <td class="num">{num(v.derate?.energy_not_delivered_kwh, 'kWh')}</td>
              <td class="num">
                {num(v.derate?.onset_heat_kw?.p50, '')} / {num(v.derate?.onset_heat_kw?.p95, 'kW')}
              </td>
            </tr>
          ))}
          <tr data-vehicle="fleet" class="total">
            <th scope="row">Fleet</th>
            <td class="num" data-col="events">
              {fleet.events}
            </td>
            <td class="num">{num(fleet.hours, 'h', 2)}</td>
            <td class="num">
              {num(fleet.of_hours > 0 ? (100 * fleet.hours) / fleet.of_hours : null, '%', 2)}
            </td>
            <td class="num">{num(fleet.energy_not_delivered_kwh, 'kWh')}</td>
            <td class="num">
              {num(fleet.onset_heat_kw?.p50, '')} / {num(fleet.onset_heat_kw?.p95, 'kW')}
            </td>
          </tr>
        </tbody>
      </table>
    </div>
  );
}

function Duty({ s }: { s: SizingResultView }) {
  const d = s.fleet.duty_cycle;
  if (!d) return <Empty>No samples were read: the duty cycle needs the stored samples.</Empty>;
  return (
    <>
      <div class="two-col">
        <DutyChart duty={d} by="speed" />
        <DutyChart duty={d} by="ambient" />
      </div>
      <p class="small muted" data-fig="time-above">
        Time above the design heat:{' '}
        {d.time_above
          .map((t) => `${num(t.share_of_design * 100, '%', 0)} of design ${num(t.hours, 'h', 1)}`)
          .join(' · ')}
      </p>
    </>
  );
}

function Sheet({ r, session }: { r: SizingResponse; session: Session }) {
  const s = r.sizing;
  return (
    <>
      <DesignNote text={r.design_note} />
      <dl class="figures">
        <Figure label="Trips" fig="trips">
          {s.period.trips}
        </Figure>
        <Figure label="Samples">{s.period.samples.toLocaleString('en')}</Figure>
        <Figure label="Period">
          {when(s.period.first_trip, false)} … {when(s.period.last_trip, false)}
        </Figure>
        <Figure label="Computed">
          {when(r.computed_at)}
          {r.trips_without_samples > 0 && (
            <div class="small muted">{r.trips_without_samples} trips without samples</div>
          )}
        </Figure>
      </dl>
      <section aria-labelledby="calc">
        <h2 id="calc">Calculator</h2>
        <SizingCalculator session={session} sizing={s} />
      </section>
      <section aria-labelledby="checks">
        <h2 id="checks">Design points against the field</h2>
        <DesignChecks s={s} />
      </section>
      <section aria-labelledby="fieldk">
        <h2 id="fieldk">Field k against the bench</h2>
        <FieldK s={s} />
      </section>
      <section aria-labelledby="airside">
        <h2 id="airside">Air side learned per vehicle</h2>
        <AirsideTable s={s} />
      </section>
      <section aria-labelledby="duty">
        <h2 id="duty">Heat-load duty cycle</h2>
        <Duty s={s} />
      </section>
      <section aria-labelledby="fouling">
        <h2 id="fouling">Fouling rate and cleaning interval</h2>
        <Fouling s={s} caution={r.safety_caution} />
      </section>
      <section aria-labelledby="derates">
        <h2 id="derates">Recorded derates</h2>
        <Derates s={s} />
      </section>
    </>
  );
}

/** Sizing sheet: what the fleet measured, as the assumptions for the next cooling package. */
export function SizingSheet({ session }: { session: Session }) {
  const live = useLive();
  // New trip results (a live `trip` event bumps the version) can change the figures.
  const res = useResource(() => session.api.call('sizing'), [session, live.version]);
  return (
    <div class="screen" data-screen="sizing">
      <h1>Sizing sheet</h1>
      <Loaded res={res} what="the fleet's sizing figures">
        {(r) => <Sheet r={r} session={session} />}
      </Loaded>
    </div>
  );
}
