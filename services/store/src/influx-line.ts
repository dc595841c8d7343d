import { SIGNAL_NAMES, type Sample } from '@thermargin/shared';
import { type DeadLetter, FRAME_TALLY_COUNTS, type FrameTally, storedTime } from './store.ts';

/**
 * Line protocol for our two measurements, formatted by hand: ids are tag-safe by construction (ids.ts)
 * and signals are finite numbers, so only free text needs escaping. The client's Point class does the
 * same work several times slower, and formatting a point already costs more than decoding its JSON.
 *
 *   samples,vehicle={id} speed_kmh=…,…,trip="{id}" {time ms}
 *   dead_letters,reason={reason}[,vehicle={id}] detail="…",topic="…",excerpt="…",payload_bytes={n}i {time ns}
 *   frame_tallies,vehicle={id} frames={n}i,decoded={n}i,… {batch start ms}
 */
export const SAMPLES_MEASUREMENT = 'samples';
export const DEAD_LETTERS_MEASUREMENT = 'dead_letters';
export const FRAME_TALLIES_MEASUREMENT = 'frame_tallies';

export function sampleLine(s: Sample): string {
  let fields = '';
  for (const name of SIGNAL_NAMES) {
    const v = s[name];
    if (v !== undefined) fields += `${fields ? ',' : ''}${name}=${v}`;
  }
  if (s.trip !== undefined) fields += `,trip="${s.trip}"`;
  return `${SAMPLES_MEASUREMENT},vehicle=${s.vehicle} ${fields} ${storedTime(s.time_ms)}`;
}

/** A string field value: backslash and quote escaped (a line break inside quotes is kept as is). */
export function fieldString(text: string): string {
  return `"${text.replace(/[\\"]/g, (c) => `\\${c}`)}"`;
}

/** `time_ns` makes each letter its own point (several can arrive in one millisecond). */
export function deadLetterLine(l: DeadLetter, time_ns: bigint): string {
  const vehicleTag = l.vehicle ? `,vehicle=${l.vehicle}` : '';
  const fields =
    `detail=${fieldString(l.detail)},topic=${fieldString(l.topic)},excerpt=${fieldString(l.excerpt)},` +
    `payload_bytes=${Math.round(l.payload_bytes)}i`;
  return `${DEAD_LETTERS_MEASUREMENT},reason=${l.reason}${vehicleTag} ${fields} ${time_ns}`;
}

/** One batch's tally: the point of vehicle + start time, so writing it again replaces it. */
export function frameTallyLine(t: FrameTally): string {
  const fields = FRAME_TALLY_COUNTS.map((c) => `${c}=${Math.round(t[c])}i`).join(',');
  return `${FRAME_TALLIES_MEASUREMENT},vehicle=${t.vehicle} ${fields} ${storedTime(t.start_ms)}`;
}
