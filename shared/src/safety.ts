import { POWERTRAINS, type Powertrain } from './fleet.ts';

/**
 * The cautions printed wherever output can lead to work on a vehicle, and the design-side note printed
 * wherever output can feed a cooling-pack design. Kept here, in one place, for the CLI, the reports, the
 * API and the dashboard; a caution names the hazards of the vehicle's own powertrain.
 */

const EVERY_VEHICLE =
  'Safety: the cooling loop holds hot coolant under pressure — let it cool before opening the cap, a hose ' +
  'or a drain; coolant (glycol) is toxic, so collect it, keep it from people, animals and drains, and ' +
  'dispose of it as local rules require; keep hands, tools and clothing clear of the fans, which can start ' +
  'on their own.';

/** What each powertrain adds to the hazards every vehicle shares. */
export const POWERTRAIN_HAZARDS: Readonly<Record<Powertrain, string>> = Object.freeze({
  ice:
    'Combustion vehicles: the engine-driven fan, its belt and pulleys turn whenever the engine runs — ' +
    'stop the engine and secure it against starting before reaching in; check fan blades for cracks and ' +
    'never run a damaged fan.',
  bev:
    'Battery-electric vehicles: the high-voltage system must be isolated, and proven dead, by staff ' +
    'qualified for high-voltage work before any cooling part near it is opened; the battery and inverter ' +
    'loops stay live and warm after the vehicle is switched off.',
  fcev:
    'Fuel-cell vehicles: high voltage as for battery-electric vehicles — isolation by staff qualified for ' +
    'high-voltage work — and hydrogen: work only where hydrogen cannot collect, with no ignition sources, ' +
    'and check for leaks before and after; the stack coolant must stay low in conductivity, so refill only ' +
    'with the coolant the maker specifies.',
});

const DEFER =
  'These findings support, and never replace, inspection and repair by qualified technicians following ' +
  "the vehicle maker's service procedures and local codes.";

/**
 * The caution for vehicles of the given powertrains (each powertrain's hazards once, in a fixed order);
 * with none given, every powertrain's, for output that covers a fleet not yet known.
 */
export function safetyCaution(powertrains: Iterable<Powertrain | string> = POWERTRAINS): string {
  const asked = new Set<string>(powertrains);
  const kinds = POWERTRAINS.filter((p) => asked.has(p));
  return [
    EVERY_VEHICLE,
    ...(kinds.length ? kinds : POWERTRAINS).map((p) => POWERTRAIN_HAZARDS[p]),
    DEFER,
  ].join('\n');
}

/** The caution covering every powertrain: the reference text the per-fleet cautions are checked against. */
export const SAFETY_CAUTION = safetyCaution();

/** Printed beside sizing figures: they come from the field, and a design needs more than that. */
export const DESIGN_NOTE =
  'Design note: these figures come from vehicles in service. They support, and never replace, validation ' +
  'testing of the cooling pack and engineering sign-off under the standards and regulations that apply ' +
  'to the vehicle.';
