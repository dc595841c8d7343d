import { CAUSE_WORD } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { causeWord } from '../../web/src/format.ts';

describe('causeWord: a cause in words, as every screen shows it', () => {
  it('a raise with no cause named reads "cause not named yet", not "no fault found"', () => {
    expect(causeWord('none', 'watch')).toBe('cause not named yet');
    expect(causeWord('none', 'inspect')).toBe('cause not named yet');
  });

  it('no cause while all is well reads as the contract words it; a named cause reads its word', () => {
    expect(causeWord('none', 'ok')).toBe(CAUSE_WORD.none);
    expect(causeWord('fouling', 'inspect')).toBe(CAUSE_WORD.fouling);
    expect(causeWord('fan', 'watch')).toBe(CAUSE_WORD.fan);
  });

  it('nothing assessed reads a dash', () => {
    expect(causeWord(null, null)).toBe('—');
    expect(causeWord(undefined, 'watch')).toBe('—');
  });
});
