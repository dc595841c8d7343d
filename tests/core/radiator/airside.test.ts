import { describe, expect, it } from 'vitest';
import {
  AIRSIDE_DEFAULTS,
  FAN_REFERENCE,
  faceVelocity_ms,
  kReferenceFactor,
  RAM_REFERENCE,
} from '@thermargin/core/radiator/airside';

describe('airside doc-comment examples', () => {
  it('faceVelocity_ms: 80 km/h, fan 0 %, defaults → 5.556 m/s', () => {
    expect(faceVelocity_ms(80, 0, AIRSIDE_DEFAULTS)).toBeCloseTo(5.556, 3);
  });

  it('kReferenceFactor: fan 80 % standing → fan 100 % gives (4/3.2)^0.5 = 1.1180', () => {
    expect(kReferenceFactor({ speed_kmh: 0, fan_pct: 80 }, FAN_REFERENCE, AIRSIDE_DEFAULTS)).toBeCloseTo(
      1.118,
      4,
    );
  });

  it('ram and fan combine as √(v_ram² + v_fan²); a condition referred to itself gives 1', () => {
    expect(faceVelocity_ms(80, 100, AIRSIDE_DEFAULTS)).toBeCloseTo(Math.hypot(80 / 14.4, 4), 12);
    expect(kReferenceFactor(RAM_REFERENCE, RAM_REFERENCE, AIRSIDE_DEFAULTS)).toBe(1);
  });
});
