import type { FittedFigure } from '@thermargin/shared';
import type { SizingResultView } from '@thermargin/shared/sizing-api';
import { BASIS_WORD } from '@thermargin/shared/sizing-text';
import { BAND_WORD, num } from '../format.ts';
import { href } from '../state/place.ts';
import { TableHead } from './TableHead.tsx';

function Figure({ f, digits, unit = '' }: { f: FittedFigure | undefined; digits: number; unit?: string }) {
  if (!f) return <td class="num">—</td>;
  return (
    <td class="num" data-basis={f.basis}>
      {num(f.value, unit, digits)}
      <div class="small muted">
        {f.ci95 ? `${num(f.ci95[0], '', digits)} … ${num(f.ci95[1], '', digits)}, ` : ''}
        {BASIS_WORD[f.basis]}
      </div>
    </td>
  );
}

/** Each vehicle's learned air side beside the core's defaults (the sizing sheet). */
export function AirsideTable({ s }: { s: SizingResultView }) {
  const d = s.airside_defaults;
  return (
    <>
      <p class="small muted">
        How k follows face velocity and how face velocity follows road speed and fan duty, fitted per vehicle
        to the variation of k within its trips (95 % interval), else the fleet file's figure or the default.
        Only the ratio of ram to fan face velocity shows in k, so the fan face velocity stays as given.
      </p>
      <div class="table-wrap">
        <table class="grid" data-table="airside">
          <TableHead
            text={['Vehicle']}
            figures={[
              `Exponent, ${BAND_WORD.ram}`,
              `Exponent, ${BAND_WORD.fan}`,
              'Ram face-velocity ratio',
              'Fan face velocity',
              'Windows / trips',
            ]}
            after={['Notes']}
          />
          <tbody>
            {d && (
              <tr class="total" data-vehicle="defaults">
                <th scope="row">Defaults</th>
                <td class="num">{num(d.velocity_exponent, '', 3)}</td>
                <td class="num">{num(d.velocity_exponent, '', 3)}</td>
                <td class="num">{num(d.ram_face_ratio, '', 3)}</td>
                <td class="num">{num(d.fan_face_velocity_ms, 'm/s', 2)}</td>
                <td />
                <td />
              </tr>
            )}
            {s.vehicles.map((v) => {
              const a = v.airside_fit;
              return (
                <tr key={v.id} data-vehicle={v.id}>
                  <th scope="row">
                    <a href={href.vehicle(v.id)}>{v.id}</a>
                  </th>
                  <Figure f={a?.velocity_exponent} digits={3} />
                  <Figure f={a?.fan_velocity_exponent} digits={3} />
                  <Figure f={a?.ram_face_ratio} digits={3} />
                  <Figure f={a?.fan_face_velocity_ms} digits={2} unit="m/s" />
                  <td class="num">{a ? `${a.windows} / ${a.trips}` : '—'}</td>
                  <td class="small">{a?.notes.join('; ') ?? ''}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </>
  );
}
