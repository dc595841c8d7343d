import { type DataMap, SIGNAL_NAMES } from '@thermargin/shared';
import { EPOCH_MS, timeReader } from './table/time-forms.ts';
import { mapValue, type ValueMap, valueMap } from './units.ts';

/** Names of the wire format's own fields: a mapped record keeps them as they are. */
const OWN_FIELDS = new Set<string>(['time', 'vehicle', 'trip', ...SIGNAL_NAMES]);

/**
 * Turns a logger's JSON record with its own field names and units into the wire format's (for the
 * ingester's sample payloads): mapped fields become their signal in its unit, the time field epoch
 * milliseconds, the vehicle and trip fields `vehicle` and `trip`; fields of the wire format's own names
 * stay, any other field is left out (the mapping says what to take, as a table's other columns are).
 * A record without a vehicle belongs to its topic's. Values that are not numbers pass unchanged, so the
 * wire schema names them. Built once per mapping.
 */
export function recordMapper(map: DataMap): (item: unknown, vehicle: string) => unknown {
  const fields = new Map<string, { signal: string; value: ValueMap }>();
  for (const [name, f] of Object.entries(map.fields ?? {}))
    fields.set(name, {
      signal: f.signal,
      value: valueMap(f.unit as Parameters<typeof valueMap>[0], f.scale, f.offset),
    });
  const timeField = map.time?.field;
  const readText = map.time ? timeReader(map.time) : undefined;
  const perUnit = map.time ? EPOCH_MS[map.time.form] : undefined;
  const vehicleField = map.vehicle && 'field' in map.vehicle ? map.vehicle.field : 'vehicle';
  const tripField = map.trip?.field ?? 'trip';
  const time = (v: unknown): unknown => {
    if (typeof v === 'number' && perUnit !== undefined) return v * perUnit;
    if (typeof v === 'string' && readText) {
      const t = readText(Buffer.from(v, 'latin1'), 0, v.length);
      return Number.isFinite(t) ? t : v;
    }
    return v;
  };
  return (item, vehicle) => {
    if (typeof item !== 'object' || item === null || Array.isArray(item)) return item;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(item)) {
      const f = fields.get(k);
      if (f) out[f.signal] = typeof v === 'number' ? mapValue(f.value, v) : v;
      else if (k === timeField) out.time = time(v);
      else if (k === vehicleField) out.vehicle = v;
      else if (k === tripField) out.trip = v;
      else if (OWN_FIELDS.has(k) && !(k in out)) out[k] = v;
    }
    out.vehicle ??= vehicle;
    return out;
  };
}
