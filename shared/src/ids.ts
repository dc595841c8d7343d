import { z } from 'zod';

/**
 * Vehicle and trip identifiers. They appear in MQTT topics, InfluxDB tags, SQL parameters and URLs,
 * so the alphabet excludes every character with a meaning in any of them (`/ + # ' " \ ..` and spaces).
 */
export const ID_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_.:-]{0,63}$/;

export const idSchema = z
  .string()
  .regex(ID_PATTERN, 'must be 1–64 characters of A–Z a–z 0–9 _ . : - starting with a letter or digit')
  .refine((s) => !s.includes('..'), 'must not contain ".."');

export function isValidId(s: unknown): s is string {
  return typeof s === 'string' && ID_PATTERN.test(s) && !s.includes('..');
}
