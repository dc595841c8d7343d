import type { SizingResultView } from '@thermargin/shared/sizing-api';
import { leftOutWords, marginStepsWords } from '@thermargin/shared/sizing-text';
import { num } from '../format.ts';
import { href } from '../state/place.ts';
import { TableHead } from './TableHead.tsx';

/**
 * Each vehicle's design point against the field: its margin as analysed now, then with the k and the
 * fouling allowance the sizing names (with their sources), so the two margins differ only by what is
 * written beside them.
 */
export function DesignChecks({ s }: { s: SizingResultView }) {
  return (
    <div class="table-wrap">
      <table class="grid" data-table="design-checks">
        <TableHead
          text={['Vehicle']}
          figures={['Margin now', 'Required area', 'Installed area', 'Margin with allowance']}
          after={['From the analysed margin to the design margin']}
        />
        <tbody>
          {s.vehicles.map((v) => {
            const c = v.design_check;
            return (
              <tr key={v.id} data-vehicle={v.id}>
                <th scope="row">
                  <a href={href.vehicle(v.id)}>{v.id}</a>
                </th>
                <td class="num" data-col="now">
                  {num(c?.margin_now_pct, '%')}
                </td>
                <td class="num">{num(c?.required_area_m2, 'm²', 3)}</td>
                <td class="num">{num(v.radiator_area_m2, 'm²', 3)}</td>
                <td class="num" data-col="design">
                  {num(c?.margin_pct, '%')}
                  {c && (
                    <div class="small muted">
                      allowance {num(c.fouling_allowance * 100, '%')}{' '}
                      {c.allowance_source === 'fouling_fit' ? 'fitted' : 'default'}
                    </div>
                  )}
                </td>
                <td class="small" data-col="steps">
                  {c ? marginStepsWords(c) : 'no k to check the design point with'}
                  {c?.allowance_note && <div class="muted">{c.allowance_note}</div>}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** What the fouling fits left out, and fits whose allowance was implausible, per vehicle and band. */
export function FoulingNotes({ s }: { s: SizingResultView }) {
  const notes = s.vehicles.flatMap((v) =>
    v.fouling.flatMap((f) =>
      [leftOutWords(f), f.fouling_allowance_note]
        .filter((x): x is string => !!x)
        .map((text) => ({ key: `${v.id}:${f.band}:${text}`, id: v.id, band: f.band, text })),
    ),
  );
  if (!notes.length) return null;
  return (
    <ul class="small" data-list="fouling-notes">
      {notes.map((n) => (
        <li key={n.key} data-vehicle={n.id} data-band={n.band}>
          <a href={href.vehicle(n.id)}>{n.id}</a>, {n.band} band: {n.text}
        </li>
      ))}
    </ul>
  );
}
