import { type Band, BAND_NAMES } from '../trip/bands.ts';
import { DerateTally, type DerateTotals } from './derate-tally.ts';
import { type DutyCycle, DutyHistograms, type TimeAbove } from './duty-cycle.ts';
import { LogHistogram } from './log-histogram.ts';
import type { SizingOptions } from './options.ts';
import { type Spread, spreadOf } from './spread.ts';
import type { VehicleSamples } from './vehicle-samples.ts';
import { percentilesOf, timeAbove, type VehicleSizing } from './vehicle-sizing.ts';
import { roundTo } from '../stats/round.ts';

export interface GroupFieldK {
  band: Band;
  /** W/(m²·K) median field k per vehicle, and field ÷ bench (median and clean), across the group's vehicles. */
  k_w_m2k: Spread | null;
  ratio: Spread | null;
  clean_ratio: Spread | null;
}

export interface GroupFouling {
  band: Band;
  loss_pct_per_month: Spread | null;
  loss_pct_per_1000km: Spread | null;
  days_to_inspect: Spread | null;
  fouling_allowance: Spread | null;
}

export interface GroupWhatIf extends Omit<DerateTotals, 'days'> {
  ambient_rise_k: number;
  limit_drop_k: number;
  /** Vehicles that derated in the replay, with their hours, most hours first. */
  vehicles_derated: { id: string; hours: number; days: number }[];
}

/** The sizing evidence of a vehicle type or of the whole fleet. */
export interface GroupSizing {
  /** The type (VehicleModel.type), or "fleet". */
  group: string;
  vehicles: string[];
  field_k: GroupFieldK[];
  fouling: GroupFouling[];
  /** Required net area from the field evidence, per vehicle: spread of required ÷ installed. */
  required_vs_installed: Spread | null;
  duty_cycle: DutyCycle | null;
  derate: (Omit<DerateTotals, 'days'> & { onset_heat_kw: Record<string, number> | null }) | null;
  what_if: GroupWhatIf[] | null;
}

const r3 = (x: number) => roundTo(x, 3);

/** Time above each level: hours summed over vehicles, each at its own design heat. */
function groupTimeAbove(members: VehicleSizing[], samples: VehicleSamples[], o: SizingOptions): TimeAbove[] {
  const designs = new Set(members.map((m) => m.design.heat_kw));
  const total = samples.reduce((s, x) => s + x.duty.all.total, 0);
  return o.heat_levels_share.map((share, i) => {
    const hours = samples.reduce(
      (s, x) => s + timeAbove(x.duty.all, x.vehicle.design.heat_kw, o)[i]!.hours,
      0,
    );
    return {
      share_of_design: share,
      heat_kw: designs.size === 1 ? r3(share * [...designs][0]!) : null,
      hours: r3(hours),
      share_of_time: total > 0 ? r3((hours * 3600) / total) : 0,
    };
  });
}

function sampleEvidence(members: VehicleSizing[], samples: VehicleSamples[], o: SizingOptions) {
  if (samples.length === 0) return { duty_cycle: null, derate: null, what_if: null };
  const duty = new DutyHistograms(o.speed_edges_kmh, o.ambient_edges_c);
  const tally = new DerateTally();
  const onsetAll = new LogHistogram();
  for (const s of samples) {
    duty.merge(s.duty);
    tally.merge(s.derate);
    onsetAll.merge(s.onsetHeat);
  }
  const { days: _days, ...totals } = tally.totals();
  const what_if: GroupWhatIf[] = o.what_if.map((sc, i) => {
    const t = new DerateTally();
    const derated: GroupWhatIf['vehicles_derated'] = [];
    for (const m of members) {
      const w = m.what_if?.[i];
      if (w && w.hours > 0) derated.push({ id: m.id, hours: w.hours, days: w.days.length });
    }
    for (const s of samples) t.merge(s.replays[i]!.tally);
    const { days: _d, ...tt } = t.totals();
    derated.sort((a, b) => b.hours - a.hours || a.id.localeCompare(b.id));
    return {
      ambient_rise_k: sc.ambient_rise_k,
      limit_drop_k: sc.limit_drop_k,
      ...tt,
      vehicles_derated: derated,
    };
  });
  return {
    duty_cycle: duty.summary(o.percentiles, groupTimeAbove(members, samples, o)),
    derate: { ...totals, onset_heat_kw: percentilesOf(onsetAll, o.percentiles) },
    what_if,
  };
}

/** Aggregates vehicles (of one type, or the fleet): spreads of per-vehicle figures, merged histograms. */
export function sizeGroup(
  group: string,
  members: VehicleSizing[],
  samples: VehicleSamples[],
  o: SizingOptions,
): GroupSizing {
  const band = <T extends { band: Band }>(xs: T[], b: Band) => xs.find((x) => x.band === b)!;
  return {
    group,
    vehicles: members.map((m) => m.id),
    field_k: BAND_NAMES.map((b) => ({
      band: b,
      k_w_m2k: spreadOf(members.map((m) => band(m.field_k, b).k_w_m2k)),
      ratio: spreadOf(members.map((m) => band(m.field_k, b).ratio)),
      clean_ratio: spreadOf(members.map((m) => band(m.field_k, b).clean_ratio)),
    })),
    fouling: BAND_NAMES.map((b) => ({
      band: b,
      loss_pct_per_month: spreadOf(members.map((m) => band(m.fouling, b).loss_pct_per_month)),
      loss_pct_per_1000km: spreadOf(members.map((m) => band(m.fouling, b).loss_pct_per_1000km)),
      days_to_inspect: spreadOf(members.map((m) => band(m.fouling, b).days_to_inspect)),
      fouling_allowance: spreadOf(members.map((m) => band(m.fouling, b).fouling_allowance)),
    })),
    required_vs_installed: spreadOf(
      members.map((m) => (m.design_check ? m.design_check.required_area_m2 / m.radiator_area_m2 : null)),
    ),
    ...sampleEvidence(members, samples, o),
  };
}
