import type {
  DeadLettersQuery,
  DeadLettersResponse,
  RejectedResponse,
  StatusResponse,
} from '@thermargin/shared/api';
import type { FramesResponse } from '@thermargin/shared/intake-api';
import type { RejectReason } from '@thermargin/shared/telemetry';
import { useState } from 'preact/hooks';
import { Empty, Loaded } from '../components/States.tsx';
import { ago, bytesText, num, refusalWord, when } from '../format.ts';
import { useLive } from '../state/live.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';
import { Figure } from '../components/Figure.tsx';
import { TableHead } from '../components/TableHead.tsx';

/** The refusal reasons present in the answer, ingest first: the table's columns. */
function reasons(r: RejectedResponse): { source: 'ingest' | 'cleaning'; reason: string }[] {
  const pick = (source: 'ingest' | 'cleaning') =>
    [...new Set(r.vehicles.flatMap((v) => Object.keys(v[source])))]
      .sort()
      .map((reason) => ({ source, reason }));
  return [...pick('ingest'), ...pick('cleaning')];
}

/** Which refused messages to list: one vehicle's ('' when unreadable) of one reason, or all. */
type LetterFilter = Pick<DeadLettersQuery, 'vehicle' | 'reason'>;
const LETTERS_SHOWN = 50;
/** Characters of a payload shown before it is opened. */
const EXCERPT_PREVIEW = 60;

function Rejected({ r, pick }: { r: RejectedResponse; pick: (f: LetterFilter) => void }) {
  if (!r.vehicles.length) return <Empty>No data was refused: every message and sample passed.</Empty>;
  const cols = reasons(r);
  const rows = [...r.vehicles].sort((a, b) => b.total - a.total || a.vehicle.localeCompare(b.vehicle));
  return (
    <div class="table-wrap">
      <table class="grid" data-table="rejected">
        <TableHead
          text={['Vehicle']}
          figures={[
            'Frames',
            'Decoded',
            'Of unknown PGNs',
            'Values not available',
            'Error values',
            'Samples built',
            'Incomplete',
          ]}
        />
        <tbody>
          {rows.map((v) => (
            <tr key={v.vehicle} data-vehicle={v.vehicle || '(unreadable)'}>
              <th scope="row">
                {v.vehicle ? <a href={href.vehicle(v.vehicle)}>{v.vehicle}</a> : <em>vehicle unreadable</em>}
              </th>
              {cols.map((c) => {
                const n = v[c.source][c.reason] ?? 0;
                return (
                  <td
                    key={`${c.source}:${c.reason}`}
                    class={`num${n ? ' bad' : ' muted'}`}
                    data-reason={c.reason}
                  >
                    {n && c.source === 'ingest' ? (
                      <button
                        type="button"
                        class="btn btn-quiet bad"
                        title="Show these messages below"
                        onClick={() => pick({ vehicle: v.vehicle, reason: c.reason as RejectReason })}
                      >
                        {n}
                      </button>
                    ) : (
                      n || '·'
                    )}
                  </td>
                );
              })}
              <td class="num" data-col="total">
                <strong>{v.total}</strong>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p class="small muted">
        Total refused: {r.total}. A vehicle with many refusals of one reason usually has a misconfigured
        logger. Pick a count refused at intake to read those messages below.
      </p>
    </div>
  );
}

function Letters({ d, filter, all }: { d: DeadLettersResponse; filter: LetterFilter; all: () => void }) {
  const which =
    filter.reason === undefined
      ? `the newest ${LETTERS_SHOWN}, all vehicles and reasons`
      : `${filter.vehicle || 'vehicle unreadable'} · ${refusalWord(filter.reason)}, newest first`;
  return (
    <div class="table-wrap">
      <p class="small muted" data-letters-filter>
        Showing {which}.{' '}
        {filter.reason !== undefined && (
          <button type="button" class="btn" onClick={all}>
            Show all
          </button>
        )}
      </p>
      {d.letters.length === 0 ? (
        <Empty>No refused messages.</Empty>
      ) : (
        <table class="grid" data-table="letters">
          <thead>
            <tr>
              <th scope="col">Received</th>
              <th scope="col">Vehicle</th>
              <th scope="col">Reason</th>
              <th scope="col">Rule broken</th>
              <th scope="col">Topic</th>
              <th scope="col" class="num">
                Size
              </th>
              <th scope="col">Payload (first 2 KiB)</th>
            </tr>
          </thead>
          <tbody>
            {d.letters.map((l, i) => (
              <tr key={`${l.received}:${i}`} data-reason={l.reason}>
                <td>{when(l.received)}</td>
                <td>{l.vehicle || <em>unreadable</em>}</td>
                <td title={l.reason}>{refusalWord(l.reason)}</td>
                <td data-col="detail">{l.detail}</td>
                <td>
                  <code>{l.topic}</code>
                </td>
                <td class="num">{bytesText(l.payload_bytes)}</td>
                <td>
                  {l.excerpt.length <= EXCERPT_PREVIEW ? (
                    <code>{l.excerpt}</code>
                  ) : (
                    <details>
                      <summary>
                        <code>{l.excerpt.slice(0, EXCERPT_PREVIEW)}…</code>
                      </summary>
                      <pre>{l.excerpt}</pre>
                    </details>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

/** Per vehicle sending CAN frames: what its frames held (counts over every frames message stored). */
function Frames({ f }: { f: FramesResponse }) {
  if (!f.vehicles.length) return <Empty>No vehicle sends CAN frames: every vehicle sends samples.</Empty>;
  const pct = (n: number, of: number) => (of ? ` (${((100 * n) / of).toFixed(1)} %)` : '');
  return (
    <div class="table-wrap">
      <table class="grid" data-table="frames">
        <thead>
          <tr>
            <th scope="col">Vehicle</th>
            <th scope="col" class="num">
              Frames
            </th>
            <th scope="col" class="num">
              Decoded
            </th>
            <th scope="col" class="num">
              Of unknown PGNs
            </th>
            <th scope="col" class="num">
              Values not available
            </th>
            <th scope="col" class="num">
              Error values
            </th>
            <th scope="col" class="num">
              Samples built
            </th>
            <th scope="col" class="num">
              Incomplete
            </th>
          </tr>
        </thead>
        <tbody>
          {f.vehicles.map((v) => (
            <tr key={v.vehicle} data-vehicle={v.vehicle}>
              <th scope="row">
                <a href={href.vehicle(v.vehicle)}>{v.vehicle}</a>
              </th>
              <td class="num">{v.frames.toLocaleString('en')}</td>
              <td class="num" data-col="decoded">
                {v.decoded.toLocaleString('en')}
                <span class="small muted">{pct(v.decoded, v.frames)}</span>
              </td>
              <td class="num" data-col="unknown_pgn">
                {v.unknown_pgn.toLocaleString('en')}
              </td>
              <td class={`num${v.not_available ? ' bad' : ''}`} data-col="not_available">
                {v.not_available.toLocaleString('en')}
              </td>
              <td class={`num${v.error_values ? ' bad' : ''}`}>{v.error_values.toLocaleString('en')}</td>
              <td class="num">{v.samples.toLocaleString('en')}</td>
              <td class={`num${v.incomplete ? ' bad' : ''}`}>{v.incomplete.toLocaleString('en')}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p class="small muted">
        SAE J1939 frames are decoded at intake; frames of PGNs nothing reads are counted, not refused. Values
        sent as "not available" or "error" count as missing. A sample missing a required signal is left out as
        incomplete: a vehicle with many needs its mapping checked.
      </p>
    </div>
  );
}

const ANALYZER_WORD: Record<StatusResponse['analyzer']['state'], string> = {
  idle: 'idle, waiting for new samples',
  working: 'working',
  stopped: 'stopped',
  separate: 'runs in its own process',
};

function Health({ s }: { s: StatusResponse }) {
  const now = Date.parse(s.time);
  const stale = s.analyzer.watermarks.filter((w) => w.analysed_to === null);
  return (
    <dl class="figures">
      <Figure label="Sample store" fig="store">
        {s.store.kind} · {s.store.up ? 'up' : `down: ${s.store.error ?? 'no answer'}`}
      </Figure>
      <Figure label="Samples stored" fig="samples">
        {s.ingest.samples.toLocaleString('en')} from {s.ingest.vehicles} vehicles
      </Figure>
      <Figure label="Newest sample">
        {when(s.ingest.last_sample)} ({num(s.ingest.lag_s === null ? null : s.ingest.lag_s / 60, 'min', 0)}{' '}
        behind)
      </Figure>
      <Figure label="Messages refused at intake" fig="dead-letters">
        {s.ingest.dead_letters}
      </Figure>
      <Figure label="Analyzer" fig="analyzer">
        <span data-state={s.analyzer.state}>{ANALYZER_WORD[s.analyzer.state]}</span> · last pass{' '}
        {ago(s.analyzer.last_run, now)}
        {s.analyzer.last_error && <div class="bad small">{s.analyzer.last_error}</div>}
      </Figure>
      <Figure label="Trips with results" fig="trips-stored">
        {s.analyzer.trips_stored.toLocaleString('en')} stored
      </Figure>
      <Figure label="Still to analyse" fig="backlog">
        {s.analyzer.backlog_vehicles} vehicles with new samples · {s.analyzer.on_trip_vehicles} on a trip now
      </Figure>
      {s.analyzer.counting_since && (
        <Figure label={`Analysed since ${when(s.analyzer.counting_since)}`} fig="since-start">
          {s.analyzer.trips_analysed.toLocaleString('en')} trips ·{' '}
          {s.analyzer.samples_analysed.toLocaleString('en')} samples
        </Figure>
      )}
      {s.analyzer.counting_since && (
        <Figure
          label={`Arrived late since ${when(s.analyzer.counting_since)}, analysed again`}
          fig="late-samples"
        >
          {s.analyzer.late_samples.toLocaleString('en')} samples
        </Figure>
      )}
      {stale.length > 0 && <Figure label="Never analysed">{stale.map((w) => w.vehicle).join(', ')}</Figure>}
    </dl>
  );
}

/**
 * Refused data and pipeline health: data refused per vehicle and reason, the refused messages themselves, and the health
 * of intake and analysis.
 */
export function RefusedData({ session }: { session: Session }) {
  const live = useLive();
  const [filter, setFilter] = useState<LetterFilter>({});
  const rejected = useResource(() => session.api.call('rejected'), [session, live.version]);
  // The answer carries the filter it was asked with: the caption then always describes the rows shown.
  const letters = useResource(
    () =>
      session.api
        .call('deadLetters', { query: { limit: LETTERS_SHOWN, ...filter } })
        .then((d) => ({ d, filter })),
    [session, live.version, filter.vehicle, filter.reason],
  );
  const status = useResource(() => session.api.call('status'), [session, live.version]);
  const frames = useResource(() => session.api.call('intakeFrames'), [session, live.version]);
  return (
    <div class="screen" data-screen="refused">
      <h1>Refused data and pipeline health</h1>
      <section aria-labelledby="refused">
        <h2 id="refused">Refused data per vehicle and reason</h2>
        <Loaded res={rejected} what="refused data">
          {(r) => <Rejected r={r} pick={setFilter} />}
        </Loaded>
      </section>
      <section aria-labelledby="letters">
        <h2 id="letters">Refused messages</h2>
        <Loaded res={letters} what="the refused messages">
          {({ d, filter }) => <Letters d={d} filter={filter} all={() => setFilter({})} />}
        </Loaded>
      </section>
      <section aria-labelledby="frames">
        <h2 id="frames">CAN frames per vehicle</h2>
        <Loaded res={frames} what="the frames taken">
          {(f) => <Frames f={f} />}
        </Loaded>
      </section>
      <section aria-labelledby="pipeline">
        <h2 id="pipeline">Intake and analysis</h2>
        <Loaded res={status} what="the pipeline status">
          {(s) => <Health s={s} />}
        </Loaded>
      </section>
    </div>
  );
}
