import { DESIGN_NOTE, type FittedFigure, safetyCaution } from '@thermargin/shared';
import { BASIS_WORD, dutyWords, leftOutWords, marginStepsWords } from '@thermargin/shared/sizing-text';
import type { SizingResult } from '@thermargin/core/sizing/fleet-sizing';
import type { GroupSizing } from '@thermargin/core/sizing/group-sizing';
import type { Spread } from '@thermargin/core/sizing/spread';
import { barChart, type DotRow, dotChart, esc } from './sizing-svg.ts';

export interface ReportSource {
  fleet: string;
  data: string;
  /** ISO time the report was made (the CLI's clock; core stays clock-free). */
  generated: string;
}

type Cell = string | number | null | undefined;

const fmt = (x: Cell, d = 1): string =>
  x === null || x === undefined ? '–' : typeof x === 'number' ? x.toFixed(d) : esc(x);
const pct = (x: number | null | undefined, d = 1) =>
  x === null || x === undefined ? '–' : `${(100 * x).toFixed(d)} %`;
const spread = (s: Spread | null, d = 2, scale = 1) =>
  s ? `${(s.median * scale).toFixed(d)} (${(s.min * scale).toFixed(d)}–${(s.max * scale).toFixed(d)})` : '–';

function table(head: string[], rows: Cell[][] | string[][]): string {
  const th = head.map((h) => `<th>${esc(h)}</th>`).join('');
  const tr = rows.map((r) => `<tr>${r.map((c) => `<td>${c ?? '–'}</td>`).join('')}</tr>`).join('');
  return `<table><thead><tr>${th}</tr></thead><tbody>${tr}</tbody></table>`;
}

const caution = (r: SizingResult) =>
  `<div class="caution">${safetyCaution(r.vehicles.map((v) => v.powertrain))
    .split('\n')
    .map((l) => `<p>${esc(l)}</p>`)
    .join('')}</div>`;
const designNote = () => `<div class="design-note">${esc(DESIGN_NOTE)}</div>`;

function summary(r: SizingResult): string {
  const rows = [...r.types, r.fleet].map((g) => {
    const band = (b: 'ram' | 'fan') => g.field_k.find((f) => f.band === b)!;
    const foul = g.fouling.find((f) => f.band === 'ram')!;
    return [
      esc(g.group),
      String(g.vehicles.length),
      spread(band('ram').ratio),
      spread(band('fan').ratio),
      spread(foul.loss_pct_per_month, 2),
      spread(foul.days_to_inspect, 0),
      spread(foul.fouling_allowance, 1, 100),
      spread(g.required_vs_installed),
    ];
  });
  return `<h2>Summary by type</h2>
<p>Median (min–max) across the vehicles of each type. Field ÷ bench below 1 means the package does less on the road than on the bench.</p>
${table(['type', 'vehicles', 'field ÷ bench k, ram', 'field ÷ bench k, fan', 'ram k loss %/month', 'days from cleaning to inspection', 'fouling allowance %', 'required ÷ installed area'], rows)}`;
}

function fieldK(r: SizingResult): string {
  const dots: DotRow[] = [];
  const rows = r.vehicles.flatMap((v) =>
    v.field_k.map((f) => {
      if (f.ratio !== null)
        dots.push({
          label: `${v.id} ${f.band}`,
          value: f.ratio,
          lo: f.ratio_ci95?.[0] ?? null,
          hi: f.ratio_ci95?.[1] ?? null,
        });
      return [
        esc(v.id),
        esc(v.type),
        f.band,
        String(f.trips),
        fmt(f.k_w_m2k, 0),
        f.k_ci95 ? `${f.k_ci95[0].toFixed(0)}–${f.k_ci95[1].toFixed(0)}` : '–',
        fmt(f.k_clean_w_m2k, 0),
        fmt(f.bench_k_w_m2k, 0),
        fmt(f.ratio, 3),
        fmt(f.clean_ratio, 3),
      ];
    }),
  );
  return `<h2>Field k against bench k</h2>
<p>k in W/(m²·K) of net frontal area, referred to each band's reference condition (ram: 80 km/h, fan off; fan: standstill, fan 100 %).</p>
${dots.length ? dotChart('Median field k ÷ bench k, with 95 % interval', '–', dots, 1) : ''}
${table(['vehicle', 'type', 'band', 'trips', 'median k', '95 % interval', 'clean k (fit)', 'bench k', 'field ÷ bench', 'clean ÷ bench'], rows)}`;
}

function dutyCycle(g: GroupSizing): string {
  const d = g.duty_cycle;
  if (!d) return '';
  const keys = Object.keys(d.overall.heat_kw ?? {});
  const chart = (title: string, bands: typeof d.by_speed) =>
    barChart(
      title,
      'kW',
      bands.map((b) => b.label),
      keys.map((k) => ({ name: k, values: bands.map((b) => b.heat_kw?.[k] ?? null) })),
    );
  const rows = [...d.by_speed, ...d.by_ambient].map((b) => [
    esc(b.label),
    fmt(b.hours, 1),
    ...keys.map((k) => fmt(b.heat_kw?.[k], 1)),
    fmt(b.heat_kw_max, 1),
  ]);
  const above = d.time_above.map((t) => [
    pct(t.share_of_design, 0),
    fmt(t.heat_kw, 1),
    fmt(t.hours, 1),
    pct(t.share_of_time),
  ]);
  return `<h3>${esc(g.group)}</h3>
${chart(`Heat to coolant by speed band — ${g.group}`, d.by_speed)}
${chart(`Heat to coolant by ambient band — ${g.group}`, d.by_ambient)}
${table(['band', 'hours', ...keys.map((k) => `${k} kW`), 'max kW'], rows)}
${table(['level (of design heat)', 'kW', 'hours above', 'share of time'], above)}`;
}

function derates(r: SizingResult): string {
  const rows = r.vehicles
    .filter((v) => v.derate)
    .map((v) => {
      const d = v.derate!;
      return [
        esc(v.id),
        esc(v.type),
        String(d.events),
        fmt(d.hours, 2),
        pct(d.share_of_time, 2),
        fmt(d.energy_not_delivered_kwh, 2),
        fmt(d.onset_heat_kw?.p50, 1),
        String(d.days.length),
      ];
    });
  return `<h2>Recorded derates</h2>
${table(['vehicle', 'type', 'events', 'hours', 'share of time', 'energy not delivered kWh (estimate)', 'onset heat p50 kW', 'days with derate'], rows)}`;
}

function fouling(r: SizingResult): string {
  const rows = r.vehicles.flatMap((v) =>
    v.fouling.map((f) => [
      esc(v.id),
      f.band,
      String(f.segments.length),
      fmt(f.loss_pct_per_month, 2),
      fmt(f.loss_pct_per_1000km, 2),
      fmt(f.k_clean_w_m2k, 0),
      f.inspect_ratio === null ? '–' : `${f.inspect_ratio.toFixed(3)} (${f.inspect_basis})`,
      fmt(f.days_to_inspect, 0),
      fmt(f.km_to_inspect, 0),
      f.fouling_allowance_note ? 'not given (below)' : pct(f.fouling_allowance),
      esc(leftOutWords(f) ?? '–'),
    ]),
  );
  const notes = r.vehicles.flatMap((v) =>
    v.fouling
      .filter((f) => f.fouling_allowance_note)
      .map((f) => `<li>${esc(v.id)}, ${f.band} band: ${esc(f.fouling_allowance_note!)}</li>`),
  );
  const ram = r.vehicles.map((v) => v.fouling.find((f) => f.band === 'ram')!.loss_pct_per_month);
  const fan = r.vehicles.map((v) => v.fouling.find((f) => f.band === 'fan')!.loss_pct_per_month);
  return `<h2>Fouling rate and cleaning interval</h2>
<p>Loss of k after cleaning (Theil–Sen line per cleaning interval). Allowance for a cleaning interval of ${r.options.cleaning_interval_days} days. Where this report suggests cleaning or inspection:</p>
${caution(r)}
${barChart(
  'k loss after cleaning',
  '%/month',
  r.vehicles.map((v) => v.id),
  [
    { name: 'ram air', values: ram },
    { name: 'fan at standstill', values: fan },
  ],
)}
${table(['vehicle', 'band', 'intervals fitted', 'loss %/month', 'loss %/1000 km', 'clean k', 'inspect at k ÷ clean', 'days to inspection', 'km to inspection', 'allowance', 'not fouling'], rows)}
<p>Trips after the health assessment names a fan fault (fan band), a coolant-side loss or a suspect sensor (both bands) are left out until the maintenance that renews the band.</p>
${notes.length ? `<ul>${notes.join('')}</ul>` : ''}`;
}

function calculator(r: SizingResult): string {
  const rows = r.vehicles.map((v) => {
    const c = v.design_check;
    if (!c) return [esc(v.id), '–', '–', '–', '–', '–', '–', '–', '–', '–', '–'];
    return [
      esc(v.id),
      `${v.design.ambient_c} °C, ${v.design.heat_kw} kW, limit ${v.coolant_limit_c} °C`,
      `${c.band} (${c.k_source})`,
      fmt(c.k_design_w_m2k, 0),
      `${pct(c.fouling_allowance)} (${c.allowance_source})`,
      fmt(c.required_area_m2, 3),
      fmt(v.radiator_area_m2, 3),
      fmt(c.supported_heat_kw, 1),
      fmt(c.supported_ambient_c, 1),
      fmt(c.margin_pct, 1),
      esc(marginStepsWords(c)),
    ];
  });
  const dt = r.drivetrains;
  const dRows = dt.rows.map((x) => [
    x.powertrain,
    pct(x.drivetrain_efficiency),
    fmt(x.energy_input_kw, 1),
    fmt(x.heat_to_coolant_kw, 1),
    fmt(x.coolant_limit_c, 0),
    fmt(x.itd_k, 0),
    fmt(x.required_area_m2, 3),
    fmt(x.area_vs_ice, 2),
  ]);
  return `<h2>Sizing calculator: design points against field evidence</h2>
<p>A_req = Q_design / (k_field · (T_limit − T_amb,design)) · (1 + fouling allowance), k_field the clean field k moved to the design air condition.</p>
<p>The margin differs from the one <code>analyze</code> reports only by the steps named: from the band's current level to the named k, then the named fouling allowance.</p>
${table(['vehicle', 'design point', 'k from', 'k at design W/(m²·K)', 'fouling allowance', 'required m²', 'installed m²', 'installed supports kW', 'installed supports up to °C', 'margin %', 'margin: analysed → design'], rows)}
<h3>Drivetrain comparison on the fleet's duty</h3>
<p>${esc(dutyWords(dt))}: aero ${dt.aero_kw.toFixed(1)} kW + rolling ${dt.rolling_kw.toFixed(1)} kW = ${dt.wheel_kw.toFixed(1)} kW at the wheels; equal k ${dt.k_w_m2k.toFixed(0)} W/(m²·K).${dt.duty_note ? ` ${esc(dt.duty_note)}.` : ''}</p>
${barChart(
  'Required net area for the same duty',
  'm²',
  dt.rows.map((x) => x.powertrain),
  [{ name: 'required area', values: dt.rows.map((x) => x.required_area_m2) }],
)}
${table(['drivetrain', 'efficiency', 'energy in kW', 'heat to coolant kW', 'limit °C', 'ITD K', 'required m²', 'area against combustion'], dRows)}`;
}

function whatIf(r: SizingResult): string {
  const parts = r.fleet.what_if?.map((w, i) => {
    const name =
      i === 0
        ? 'Recorded conditions (check of the replay)'
        : `Ambient +${w.ambient_rise_k} K, limit −${w.limit_drop_k} K`;
    const rows = r.vehicles.map((v) => {
      const x = v.what_if![i]!;
      const days = x.days
        .map((d) => `${d.date} ${(d.hours * 60).toFixed(0)} min`)
        .slice(0, 8)
        .join(', ');
      return [
        esc(v.id),
        fmt(x.coolant_limit_c, 0),
        fmt(x.design_ambient_c, 0),
        String(x.events),
        fmt(x.hours, 2),
        fmt(x.energy_not_delivered_kwh, 2),
        `${x.days.length}${days ? `: ${esc(days)}${x.days.length > 8 ? ', …' : ''}` : ''}`,
        fmt(x.hours_not_replayed, 1),
      ];
    });
    return `<h3>${esc(name)}</h3>
<p>${w.vehicles_derated.length} of ${r.vehicles.length} vehicles derate: ${w.hours.toFixed(2)} h in ${w.events} events, ${w.energy_not_delivered_kwh.toFixed(1)} kWh not delivered.</p>
${table(['vehicle', 'limit °C', 'design ambient °C', 'events', 'hours', 'kWh not delivered', 'days (first 8)', 'hours not replayed'], rows)}`;
  });
  return parts ? `<h2>What if: replay of the days driven</h2>${parts.join('')}` : '';
}

function airside(r: SizingResult): string {
  const d = r.airside_defaults;
  const fig = (f: FittedFigure, digits: number) =>
    `${f.value.toFixed(digits)}${f.ci95 ? ` (${f.ci95[0].toFixed(digits)}–${f.ci95[1].toFixed(digits)})` : ''} ${esc(BASIS_WORD[f.basis])}`;
  const rows = r.vehicles.map((v) => {
    const a = v.airside_fit;
    if (!a) return [esc(v.id), '–', '–', '–', '–', '–', '–'];
    return [
      esc(v.id),
      fig(a.velocity_exponent, 3),
      fig(a.fan_velocity_exponent, 3),
      fig(a.ram_face_ratio, 3),
      fig(a.fan_face_velocity_ms, 2),
      `${a.windows} / ${a.trips}`,
      esc(a.notes.join('; ')) || '–',
    ];
  });
  return `<h2>Air side learned per vehicle</h2>
<p>How k follows face velocity (k ∝ v_face^n) and how face velocity follows road speed and fan duty, fitted per vehicle to the variation of k within its trips (95 % interval in brackets), else the fleet file's figure or the default. Defaults: exponent ${d.velocity_exponent}, ram face-velocity ratio ${d.ram_face_ratio}, fan face velocity ${d.fan_face_velocity_ms} m/s. Only the ratio of ram to fan face velocity shows in k, so the fan face velocity stays the fleet file's or the default.</p>
${table(['vehicle', 'exponent, ram air', 'exponent, fan at standstill', 'ram face-velocity ratio', 'fan face velocity m/s', 'windows / trips', 'notes'], rows)}`;
}

function method(r: SizingResult): string {
  const rows = r.method.map((m) => [esc(m.topic), esc(m.text), esc(m.source)]);
  return `<h2>Method and sources</h2>${table(['figure', 'method', 'source'], rows)}`;
}

const CSS = `body{font:13px/1.45 system-ui,sans-serif;margin:24px auto;max-width:1000px;color:#1a202c}
h1{font-size:20px}h2{font-size:16px;margin-top:28px;border-bottom:1px solid #cbd5e0}h3{font-size:14px}
table{border-collapse:collapse;margin:8px 0 16px;font-size:12px}th,td{border:1px solid #cbd5e0;padding:3px 6px;text-align:left;vertical-align:top}
th{background:#edf2f7}.caution{border:2px solid #c05621;background:#fffaf0;padding:8px 12px;margin:12px 0}.caution p{margin:4px 0}
.design-note{border:2px solid #2b6cb0;background:#ebf8ff;padding:8px 12px;margin:12px 0}
svg{display:block;margin:8px 0;max-width:100%;height:auto}@media print{h2{page-break-after:avoid}}`;

/** The self-contained HTML report (inline CSS and SVG, no scripts, no external assets). */
export function sizingHtml(r: SizingResult, src: ReportSource): string {
  const p = r.period;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Cooling sizing evidence</title><style>${CSS}</style></head>
<body>
<h1>Cooling sizing evidence from the fleet</h1>
<p>Fleet file ${esc(src.fleet)}, data ${esc(src.data)}; ${r.vehicles.length} vehicles, ${p.trips} trips, ${p.samples.toLocaleString('en-US')} samples, ${esc(p.first_trip ?? '–')} to ${esc(p.last_trip ?? '–')}. Made ${esc(src.generated)}.</p>
${designNote()}
${caution(r)}
${summary(r)}
${fieldK(r)}
${airside(r)}
<h2>Heat-load duty cycle</h2>
<p>Heat generated into the coolant, time-weighted percentiles; levels as shares of each vehicle's design heat.</p>
${[...r.types, r.fleet].map(dutyCycle).join('')}
${derates(r)}
${fouling(r)}
${calculator(r)}
${whatIf(r)}
${method(r)}
</body></html>
`;
}
