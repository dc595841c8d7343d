import { readStackConfig } from '@thermargin/stack/stack-config';
import { describe, expect, it } from 'vitest';

describe("npm start's own variables", () => {
  it('takes decimal numbers only, naming each bad variable with what it got', () => {
    expect(readStackConfig({ THERMARGIN_BROKER_PORT: '1884', THERMARGIN_SPEEDUP: '2.5' })).toMatchObject({
      broker_port: 1884,
      speedup: 2.5,
    });
    expect(() =>
      readStackConfig({ THERMARGIN_BROKER_PORT: '0x10', THERMARGIN_DEMO_DAYS: 'Infinity' }),
    ).toThrow(
      'THERMARGIN_BROKER_PORT must be an integer ≥ 0 (got "0x10")\n  THERMARGIN_DEMO_DAYS must be an integer ≥ 1 (got "Infinity")',
    );
  });
});
