import { SIGNAL_QUANTITY, SIGNALS, type SignalName, UNITS, type Unit } from '@thermargin/shared';
import { mapValue, ownUnit, valueMap } from '../units.ts';

const ASCII_TWINS = new Set<string>(['degC', 'degF', 'm3/h']);

/** A number as people write it in a message: at most 4 significant digits, no trailing zeros. */
const short = (x: number) => String(Number(x.toPrecision(4)));

/**
 * What values outside a signal's plausible range look like, for the message when most rows of a file
 * fail that range: the other units of the signal's quantity under which the whole observed range
 * [min, max] would be plausible, e.g. "coolant_in_c values 150–210: a °F column? see --map".
 */
export function rangeHint(signal: SignalName, min: number, max: number): string {
  const spec = SIGNALS[signal];
  const own = ownUnit(signal);
  const fits = (UNITS[SIGNAL_QUANTITY[signal]] as readonly Unit[]).filter((u) => {
    if (u === own || ASCII_TWINS.has(u)) return false;
    const m = valueMap(u);
    const [a, b] = [mapValue(m, min), mapValue(m, max)].sort((x, y) => x - y);
    return a! >= spec.min && b! <= spec.max;
  });
  const values = `${signal} values ${short(min)}–${short(max)}`;
  if (fits.length) return `${values}: ${fits.map((u) => `a ${u} column`).join(' or ')}? see --map`;
  return `${values}, outside ${short(spec.min)}…${short(spec.max)} ${own}: check the column's unit or scale (see --map)`;
}
