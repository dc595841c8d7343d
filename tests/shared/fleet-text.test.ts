import { InputError, parseFleetText } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { BUS_CONFIG } from '../support/vehicle-fixture.ts';

function problems(text: string): string[] {
  try {
    parseFleetText(text, 'fleet.json');
  } catch (e) {
    if (e instanceof InputError) return e.problems.map((p) => `${p.where}: ${p.rule}`);
    throw e;
  }
  return [];
}

describe('parseFleetText', () => {
  it('accepts the contract example shape', () => {
    expect(problems(JSON.stringify({ vehicles: [BUS_CONFIG] }))).toEqual([]);
  });

  it('names the line and column of a JSON syntax error', () => {
    const [p] = problems('{"vehicles": [\n  {"id": "a",}\n]}');
    expect(p).toMatch(/^fleet\.json:2:\d+: not valid JSON/);
  });

  it('names the field path and the rule broken', () => {
    const bad = {
      vehicles: [BUS_CONFIG, { ...BUS_CONFIG, id: 'bus-02', radiator_area_m2: -1, powertrain: 'steam' }],
    };
    const ps = problems(JSON.stringify(bad));
    expect(ps).toContain('fleet.json: vehicles[1].radiator_area_m2: radiator_area_m2 must be > 0');
    expect(ps.some((p) => p.startsWith('fleet.json: vehicles[1].powertrain:'))).toBe(true);
  });

  it('refuses duplicate ids, unknown keys and ids unsafe for topics or queries', () => {
    expect(problems(JSON.stringify({ vehicles: [BUS_CONFIG, BUS_CONFIG] }))).toEqual([
      'fleet.json: vehicles: vehicle ids must be unique',
    ]);
    expect(problems(JSON.stringify({ vehicles: [{ ...BUS_CONFIG, colour: 'red' }] }))[0]).toMatch(
      /vehicles\[0\]/,
    );
    expect(problems(JSON.stringify({ vehicles: [{ ...BUS_CONFIG, id: "x' OR '1'='1" }] }))[0]).toMatch(
      /vehicles\[0\]\.id/,
    );
  });
});
