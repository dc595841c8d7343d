import type { RejectReason } from '@thermargin/shared';

/** A hostile message: what is published, by whom, and the reason it must be refused with. */
export interface BadMessage {
  publisher: string;
  topic_vehicle: string;
  payload: string | Buffer;
  reason: RejectReason;
}

const good = (vehicle: string, i: number) => ({
  time: Date.UTC(2025, 6, 1) + i * 1000,
  vehicle,
  speed_kmh: 40,
  power_kw: 90,
  coolant_in_c: 75,
  ambient_c: 30,
  fan_pct: 50,
});

/** ≥ 1 000 malformed or hostile messages, deterministic, each refused whole with one dead letter. */
export function hostileCorpus(vehicle: string, other: string, ghost: string): BadMessage[] {
  const out: BadMessage[] = [];
  const add = (payload: string | Buffer, reason: RejectReason, publisher = vehicle) =>
    out.push({ publisher, topic_vehicle: publisher, payload, reason });
  for (let i = 0; i < 200; i++) {
    const text = JSON.stringify(good(vehicle, i));
    add(text.slice(0, 1 + ((i * 7) % (text.length - 2))), 'json'); // truncated
  }
  const fields = ['speed_kmh', 'power_kw', 'coolant_in_c', 'ambient_c', 'fan_pct'] as const;
  const wrongTypes: unknown[] = ['12', true, null, [1], { v: 1 }, ''];
  for (let i = 0; i < 180; i++) {
    add(
      JSON.stringify({ ...good(vehicle, i), [fields[i % 5]!]: wrongTypes[i % wrongTypes.length] }),
      'schema',
    );
  }
  for (let i = 0; i < 100; i++) {
    const literal = ['NaN', 'Infinity', '-Infinity', 'undefined'][i % 4]!;
    add(JSON.stringify(good(vehicle, i)).replace('"speed_kmh":40', `"speed_kmh":${literal}`), 'json');
  }
  for (let i = 0; i < 100; i++) {
    const huge = ['1e400', '-1e400', '1e308', '9007199254740993123', '-1e300'][i % 5]!;
    const reason: RejectReason = 'range'; // 1e400 parses to Infinity: not finite; the others are out of range
    add(JSON.stringify(good(vehicle, i)).replace('"power_kw":90', `"power_kw":${huge}`), reason);
  }
  for (let i = 0; i < 10; i++)
    add(`${'['.repeat(10_000 * (i + 1))}${']'.repeat(10_000 * (i + 1))}`, 'schema');
  for (let i = 0; i < 10; i++)
    add(`${'{"a":'.repeat(5000 * (i + 1))}1${'}'.repeat(5000 * (i + 1))}`, 'schema');
  add(Buffer.alloc(10 * 1024 * 1024, 0x20), 'oversize'); // 10 MB of spaces
  add(`[${Array.from({ length: 60_000 }, () => JSON.stringify(good(vehicle, 0))).join(',')}]`, 'oversize'); // 10 MB batch
  for (let i = 0; i < 100; i++) add(JSON.stringify(good(other, i)), 'vehicle_mismatch');
  for (let i = 0; i < 100; i++) add(JSON.stringify({ ...good(vehicle, i), [`extra_${i % 7}`]: 1 }), 'schema');
  for (let i = 0; i < 50; i++) add(JSON.stringify({ ...good(vehicle, i), time: i * 1000 }), 'time_past'); // 1970
  for (let i = 0; i < 50; i++) {
    add(
      JSON.stringify({ ...good(vehicle, i), time: `2100-01-01T00:00:${String(i % 60).padStart(2, '0')}Z` }),
      'time_future',
    );
  }
  for (let i = 0; i < 50; i++) add(JSON.stringify(good(ghost, i)), 'unknown_vehicle', ghost);
  for (let i = 0; i < 50; i++)
    add(Buffer.from(Array.from({ length: 64 + i }, (_, k) => (k * 37 + i) % 256)), 'json');
  for (const p of ['', 'null', '42', '"text"', 'true']) add(p, p === '' ? 'json' : 'schema');
  add('[]', 'schema');
  add(JSON.stringify({ ...good(vehicle, 0), derate: 0.5 }), 'schema');
  add(JSON.stringify({ ...good(vehicle, 0), trip: 'a/b' }), 'schema');
  add(JSON.stringify({ ...good(vehicle, 0), fan_pct: 101 }), 'range');
  add(JSON.stringify({ ...good(vehicle, 0), time: 'yesterday' }), 'schema');
  return out;
}
