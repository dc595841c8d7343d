import { emptyColumns, type SampleColumns } from '@thermargin/shared';

/**
 * Invented benchmark data (not a check of anything): 1 Hz trips of one hour with 10-minute stops,
 * alternating highway and crawl, a lumped loop so that both bands have valid windows.
 */
export function syntheticColumns(n: number, seed = 1): SampleColumns {
  const c = emptyColumns(n);
  let s = seed;
  const rnd = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647 - 0.5;
  };
  let T = 60;
  let t = Date.UTC(2026, 5, 1);
  for (let i = 0; i < n; i++) {
    const inTrip = i % 3600;
    if (inTrip === 0) {
      t += 600_000;
      T = Math.max(T - 8, 40);
    }
    const highway = Math.floor(inTrip / 900) % 2 === 0;
    const speed = highway ? 85 + 10 * Math.sin(i / 200) : 8 + 6 * Math.sin(i / 30);
    const fan = highway ? 0 : 100;
    const p = highway ? 70 + 25 * Math.sin(i / 97) : 25 + 15 * Math.sin(i / 41);
    const q = (p * 0.55) / 0.45;
    const kA = highway ? 1.8 * Math.sqrt(speed / 80) : 1.6;
    T += (q - kA * (T - 38)) / 150;
    c.time_ms[i] = t;
    c.speed_kmh[i] = speed;
    c.power_kw[i] = p;
    c.coolant_in_c[i] = T + 0.2 * rnd();
    c.coolant_out_c[i] = Number.NaN;
    c.ambient_c[i] = 38;
    c.fan_pct[i] = fan;
    c.coolant_flow_lpm[i] = Number.NaN;
    c.derate[i] = 0;
    t += 1000;
  }
  return c;
}
