import type { Powertrain } from '@thermargin/shared/fleet';
import type { CalculatorResponse, SizingResultView } from '@thermargin/shared/sizing-api';
import { dutyWords } from '@thermargin/shared/sizing-text';
import { useEffect, useState } from 'preact/hooks';
import { ApiFailure } from '../api/client.ts';
import { num, POWERTRAIN_WORD } from '../format.ts';
import { type CalculatorForm, calculatorBody, defaultForm } from '../state/calculator.ts';
import { useResource } from '../state/resource.ts';
import { href } from '../state/place.ts';
import type { Session } from '../state/session.ts';
import { Loading } from './States.tsx';
import { TableHead } from './TableHead.tsx';
import { Figure } from './Figure.tsx';

const SOURCE_WORD = { given: 'as entered', field: 'from the field', default: 'default' } as const;

/** ms an input waits for the next keystroke before the answer is asked for. */
const SETTLE_MS = 250;

function useSettled<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return settled;
}

type Field = Exclude<keyof CalculatorForm, 'powertrain'>;

function NumberInput({
  form,
  set,
  name,
  label,
  hint,
  step = 'any',
}: {
  form: CalculatorForm;
  set: (name: Field, v: string) => void;
  name: Field;
  label: string;
  hint?: string;
  step?: string;
}) {
  return (
    <label class="calc-field">
      <span>{label}</span>
      <input
        type="number"
        step={step}
        name={name}
        value={form[name]}
        placeholder={hint}
        onInput={(e) => set(name, (e.target as HTMLInputElement).value)}
      />
    </label>
  );
}

function Answer({ a }: { a: CalculatorResponse }) {
  const d = a.design;
  return (
    <>
      <dl class="figures" data-answer="design">
        <Figure label="Required net area" fig="required-area">
          {num(d.required_area_m2, 'm²', 3)}
        </Figure>
        <Figure label="Heat the area carries" fig="supported-heat">
          {num(d.supported_heat_kw, 'kW')}
        </Figure>
        <Figure label="Hottest ambient for the design heat" fig="supported-ambient">
          {num(d.supported_ambient_c, '°C')}
        </Figure>
        <Figure label="Margin of the area" fig="area-margin">
          {num(d.margin_pct, '%')}
        </Figure>
        <Figure label="ITD">{num(d.itd_k, 'K')}</Figure>
        <Figure label="k used" fig="k">
          {num(a.basis.k_w_m2k, 'W/(m²·K)', 0)}{' '}
          <span class="small muted">
            {SOURCE_WORD[a.basis.k_source]}; fouled {num(d.k_fouled_w_m2k, '', 0)}
          </span>
        </Figure>
        <Figure label="Fouling allowance" fig="allowance">
          {num(a.basis.fouling_allowance * 100, '%')}{' '}
          <span class="small muted">{SOURCE_WORD[a.basis.allowance_source]}</span>
        </Figure>
      </dl>
      <h3>Drivetrains on the same duty</h3>
      <p class="small muted" data-fig="duty">
        {dutyWords(a.drivetrains)}: wheel power {num(a.drivetrains.wheel_kw, 'kW')} (aero{' '}
        {num(a.drivetrains.aero_kw, 'kW')}, rolling {num(a.drivetrains.rolling_kw, 'kW')}); same k and
        allowance for all.{a.drivetrains.duty_note && ` ${a.drivetrains.duty_note}.`}
      </p>
      <div class="table-wrap">
        <table class="grid" data-table="drivetrains">
          <TableHead
            text={['Drivetrain']}
            figures={[
              'Efficiency',
              'Heat to coolant',
              'Coolant limit',
              'ITD',
              'Required area',
              'Area against combustion',
            ]}
          />
          <tbody>
            {a.drivetrains.rows.map((r) => (
              <tr key={r.powertrain} data-powertrain={r.powertrain}>
                <th scope="row">{POWERTRAIN_WORD[r.powertrain]}</th>
                <td class="num">{num(r.drivetrain_efficiency * 100, '%', 0)}</td>
                <td class="num" data-col="heat">
                  {num(r.heat_to_coolant_kw, 'kW')}
                </td>
                <td class="num">{num(r.coolant_limit_c, '°C', 0)}</td>
                <td class="num">{num(r.itd_k, 'K', 0)}</td>
                <td class="num" data-col="area">
                  {num(r.required_area_m2, 'm²', 3)}
                </td>
                <td class="num" data-col="ratio">
                  {num(r.area_vs_ice, '×', 2)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {a.what_if && <WhatIf w={a.what_if} />}
    </>
  );
}

function WhatIf({ w }: { w: NonNullable<CalculatorResponse['what_if']> }) {
  const f = w.fleet;
  const derated = w.vehicles.filter((v) => v.hours > 0);
  return (
    <>
      <h3>
        What if the ambient had been {f.ambient_rise_k} K higher and the coolant limit {f.limit_drop_k} K
        lower
      </h3>
      <p data-fig="what-if-summary">
        {derated.length} of {w.vehicles.length} vehicles would have derated on the days they drove: {f.events}{' '}
        events, {num(f.hours, 'h', 2)} of {num(f.of_hours, 'h', 0)} replayed,{' '}
        {num(f.energy_not_delivered_kwh, 'kWh')} not delivered.
      </p>
      {derated.length > 0 && (
        <div class="table-wrap">
          <table class="grid" data-table="what-if">
            <TableHead
              text={['Vehicle']}
              figures={[
                'Design ambient',
                'Coolant limit',
                'Events',
                'Hours derated',
                'Days',
                'Not delivered',
              ]}
            />
            <tbody>
              {derated.map((v) => (
                <tr key={v.id} data-vehicle={v.id}>
                  <th scope="row">
                    <a href={href.vehicle(v.id)}>{v.id}</a>
                  </th>
                  <td class="num">{num(v.design_ambient_c, '°C')}</td>
                  <td class="num">{num(v.coolant_limit_c, '°C')}</td>
                  <td class="num">{v.events}</td>
                  <td class="num" data-col="hours">
                    {num(v.hours, 'h', 2)}
                  </td>
                  <td class="num" title={v.days.map((d) => d.date).join(', ')}>
                    {v.days.length}
                    <span class="small muted">
                      {' '}
                      ({v.days[0]?.date.slice(5)} … {v.days.at(-1)?.date.slice(5)})
                    </span>
                  </td>
                  <td class="num">{num(v.energy_not_delivered_kwh, 'kWh')}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}

/** The interactive calculator: each change asks the API again (after a short pause in typing). */
export function SizingCalculator({ session, sizing }: { session: Session; sizing: SizingResultView }) {
  const [form, setForm] = useState(() => defaultForm(sizing));
  const set = (name: keyof CalculatorForm, v: string) => setForm((f) => ({ ...f, [name]: v }));
  const body = useSettled(JSON.stringify(calculatorBody(form)), SETTLE_MS);
  const answer = useResource(
    () => session.api.call('calculator', { body: JSON.parse(body) }),
    [session, body],
  );
  const problems = answer.error instanceof ApiFailure ? answer.error.problems : [];
  return (
    <div class="calc">
      <form class="calc-form card" onSubmit={(e) => e.preventDefault()} aria-label="Design question">
        <fieldset>
          <legend>Design point</legend>
          <NumberInput form={form} set={set} name="ambient_c" label="Design ambient (°C)" />
          <NumberInput form={form} set={set} name="heat_kw" label="Design heat to coolant (kW)" />
          <NumberInput form={form} set={set} name="coolant_limit_c" label="Coolant limit (°C)" />
          <NumberInput
            form={form}
            set={set}
            name="area_m2"
            label="Radiator area to check (m²)"
            hint="empty: size it"
          />
          <NumberInput form={form} set={set} name="fouling_pct" label="Fouling allowance (%)" hint="field" />
          <NumberInput form={form} set={set} name="k_w_m2k" label="k (W/(m²·K))" hint="field k" />
          <label class="calc-field">
            <span>k and fouling from</span>
            <select
              name="powertrain"
              value={form.powertrain}
              onChange={(e) => set('powertrain', (e.target as HTMLSelectElement).value)}
            >
              <option value="">whole fleet</option>
              {(Object.keys(POWERTRAIN_WORD) as Powertrain[]).map((p) => (
                <option key={p} value={p}>
                  {POWERTRAIN_WORD[p]} vehicles
                </option>
              ))}
            </select>
          </label>
        </fieldset>
        <fieldset>
          <legend>Drivetrain duty</legend>
          {(
            [
              ['speed_kmh', 'Speed (km/h)'],
              ['mass_kg', 'Mass (kg)'],
            ] as const
          ).map(([name, label]) => (
            <NumberInput
              key={name}
              form={form}
              set={set}
              name={name}
              label={label}
              hint={`fleet ${num(sizing.drivetrains.duty[name], '', 0)}`}
            />
          ))}
        </fieldset>
        <fieldset>
          <legend>What if, over the recorded days</legend>
          <NumberInput form={form} set={set} name="ambient_rise_k" label="Ambient raised by (K)" />
          <NumberInput form={form} set={set} name="limit_drop_k" label="Coolant limit lowered by (K)" />
        </fieldset>
        <button type="button" class="btn btn-quiet" onClick={() => setForm(defaultForm(sizing))}>
          Back to the fleet's typical vehicle
        </button>
      </form>
      <div class="calc-answer" aria-live="polite" data-state={answer.state}>
        {answer.state === 'loading' && <Loading what="the answer" />}
        {answer.state === 'error' && (
          <div class="state state-error" role="alert" data-problems={problems.length}>
            <strong>Not answered:</strong> {answer.error.message}
            {problems.length > 0 && (
              <ul>
                {problems.map((p) => (
                  <li key={`${p.where}: ${p.rule}`}>
                    <code>{p.where.replace(/^body: /, '')}</code>: {p.rule}
                  </li>
                ))}
              </ul>
            )}
          </div>
        )}
        {answer.data && (
          <div class={answer.state === 'error' ? 'stale' : undefined}>
            <Answer a={answer.data} />
          </div>
        )}
      </div>
    </div>
  );
}
