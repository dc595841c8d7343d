import { SAFETY_CAUTION, safetyCaution } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';

describe('the safety caution fits the powertrain', () => {
  it('names every vehicle’s hazards and defers to the maker, local codes and qualified technicians', () => {
    for (const p of ['ice', 'bev', 'fcev'] as const) {
      const c = safetyCaution([p]);
      for (const words of [
        'under pressure',
        'toxic',
        'dispose',
        'start on their own',
        'service procedures',
        'local codes',
        'qualified technicians',
      ])
        expect(c, `${p}: ${words}`).toContain(words);
    }
  });

  it('a combustion vehicle’s names the engine-driven fan, belt and blades and no high voltage', () => {
    const c = safetyCaution(['ice']);
    expect(c).toMatch(/engine-driven fan/);
    expect(c).toMatch(/belt/);
    expect(c).toMatch(/fan blades/);
    expect(c).not.toMatch(/high-voltage|hydrogen/);
  });

  it('battery-electric and fuel-cell ones name high-voltage isolation by qualified staff; fuel-cell hydrogen', () => {
    expect(safetyCaution(['bev'])).toMatch(/isolated.*by staff\s+qualified for high-voltage work/s);
    expect(safetyCaution(['bev'])).not.toMatch(/hydrogen|engine-driven/);
    expect(safetyCaution(['fcev'])).toMatch(/hydrogen/);
    expect(safetyCaution(['fcev'])).toMatch(/qualified for high-voltage work/);
  });

  it('a mixed fleet gets each powertrain’s part once; none known gets them all', () => {
    expect(safetyCaution(['ice', 'fcev', 'ice'])).toBe(safetyCaution(['fcev', 'ice']));
    expect(safetyCaution(['ice', 'fcev']).split('\n')).toHaveLength(4);
    expect(safetyCaution([])).toBe(SAFETY_CAUTION);
    expect(safetyCaution(['unknown-kind'])).toBe(SAFETY_CAUTION);
  });
});
