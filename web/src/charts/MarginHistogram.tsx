import type { VehicleSummary } from '@thermargin/shared/api';

const BIN_PCT = 5;

export interface Bin {
  from_pct: number;
  count: number;
}

/** Vehicles per 5 % band of margin at the design point (unassessed vehicles are left out). */
export function marginBins(vehicles: readonly VehicleSummary[]): Bin[] {
  const m = vehicles.map((v) => v.margin_pct).filter((x): x is number => x !== null && Number.isFinite(x));
  if (!m.length) return [];
  const lo = Math.floor(Math.min(...m) / BIN_PCT) * BIN_PCT;
  const hi = Math.floor(Math.max(...m) / BIN_PCT) * BIN_PCT;
  const bins: Bin[] = [];
  for (let b = lo; b <= hi; b += BIN_PCT) bins.push({ from_pct: b, count: 0 });
  for (const x of m) bins[Math.floor((x - lo) / BIN_PCT)]!.count++;
  return bins;
}

/** A compact bar chart of the fleet's margin distribution; bars below 0 % are hatched as well as coloured. */
export function MarginHistogram({ vehicles }: { vehicles: readonly VehicleSummary[] }) {
  const bins = marginBins(vehicles);
  if (!bins.length) return <p class="muted">No vehicle has a margin yet.</p>;
  const W = 420;
  const H = 120;
  const pad = { l: 30, r: 6, t: 8, b: 30 };
  const max = Math.max(...bins.map((b) => b.count));
  const bw = (W - pad.l - pad.r) / bins.length;
  const y = (c: number) => pad.t + (H - pad.t - pad.b) * (1 - c / max);
  const every = Math.ceil(bins.length / 8);
  return (
    <figure class="chart histogram" data-chart="fleet-margin" data-bins={JSON.stringify(bins)}>
      <figcaption>Margin at the design point across the fleet (vehicles per {BIN_PCT} % band)</figcaption>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={bins.map((b) => `${b.from_pct} %: ${b.count}`).join(', ')}
      >
        <defs>
          <pattern
            id="hatch"
            width="5"
            height="5"
            patternUnits="userSpaceOnUse"
            patternTransform="rotate(45)"
          >
            <rect width="5" height="5" fill="var(--inspect)" />
            <line x1="0" y1="0" x2="0" y2="5" stroke="#fff" stroke-width="2" />
          </pattern>
        </defs>
        <line x1={pad.l} x2={W - pad.r} y1={H - pad.b} y2={H - pad.b} class="hist-axis" />
        <text x={pad.l - 4} y={y(max) + 4} class="hist-label" text-anchor="end">
          {max}
        </text>
        <text x={pad.l - 4} y={H - pad.b} class="hist-label" text-anchor="end">
          0
        </text>
        {bins.map((b, i) => (
          <g key={b.from_pct}>
            <rect
              x={pad.l + i * bw + 1}
              y={y(b.count)}
              width={Math.max(1, bw - 2)}
              height={H - pad.b - y(b.count)}
              fill={b.from_pct < 0 ? 'url(#hatch)' : 'var(--accent)'}
            >
              <title>{`${b.from_pct} to ${b.from_pct + BIN_PCT} %: ${b.count} vehicles`}</title>
            </rect>
            {i % every === 0 && (
              <text x={pad.l + i * bw} y={H - pad.b + 14} class="hist-label" text-anchor="middle">
                {b.from_pct}
              </text>
            )}
          </g>
        ))}
        <text x={(W + pad.l) / 2} y={H - 2} class="hist-label" text-anchor="middle">
          margin at the design point (%)
        </text>
      </svg>
    </figure>
  );
}
