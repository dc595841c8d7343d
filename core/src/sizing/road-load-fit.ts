import { G_MS2 } from '../drivetrain/road-load.ts';

/**
 * A vehicle's road-load figures as its own samples show them. The mass rests on the accelerations and
 * is well told; CdA and Crr rest on how the force grows with speed, which unknown grades blur (climbs
 * are driven slowly), so each is null when it comes out implausible.
 */
export interface RoadLoadEstimate {
  mass_kg: number;
  cda_m2: number | null;
  crr: number | null;
  /** kW: steady power drawn besides traction (auxiliaries), in the power signal too. */
  aux_kw: number;
  /** Samples the fit used. */
  samples: number;
}

/** Samples below which the fit is not trusted (about ten minutes of moving, accelerating driving). */
const MIN_SAMPLES = 600;
/** m/s², 0.1: spread of the accelerations below which the mass cannot be told (steady cruising only). */
const MIN_ACCEL_SD = 0.1;
/** Plausible ranges: outside them the fit is taken as failed, not as a vehicle (our bounds). */
const RANGE = { mass_kg: [300, 80_000], cda_m2: [0.4, 10], crr: [0.004, 0.02] } as const;

/**
 * Mass, CdA, rolling resistance and auxiliary power of a vehicle from its own samples, by least squares
 * of the tractive force F = P/v on ½ρv², g, a and 1/v, from the road-load equation
 * P = ½ρ·CdA·v³ + m·g·Crr·v + m·a·v + P_aux (Gillespie, Fundamentals of Vehicle Dynamics, 1992, ch. 4);
 * fitting drive data to it is how vehicle mass is commonly estimated on the road (e.g. Vahidi,
 * Stefanopoulou & Peng 2005, Vehicle System Dynamics 43(1); from memory). The grade is unknown and stays
 * in the residual: on rolling roads it averages out, a route mostly uphill would bias m·Crr.
 * Example: samples of P = 0.5·1.2·0.6·v³ + 1500·9.81·0.01·v + 1500·a·v exactly → 1500 kg, 0.6 m², 0.01.
 */
export class RoadLoadFit {
  /** Normal equations XᵀX (4×4, row-major) and Xᵀy of the four regressors. */
  private readonly xtx = new Float64Array(16);
  private readonly xty = new Float64Array(4);
  samples = 0;

  /** One sample: speed m/s, acceleration m/s², power kW (traction plus auxiliaries), air density kg/m³. */
  add(v_ms: number, a_ms2: number, power_kw: number, rho_kg_m3: number): void {
    const x = [0.5 * rho_kg_m3 * v_ms * v_ms, G_MS2, a_ms2, 1 / v_ms];
    const y = (power_kw * 1000) / v_ms;
    for (let r = 0; r < 4; r++) {
      this.xty[r]! += x[r]! * y;
      for (let c = 0; c < 4; c++) this.xtx[r * 4 + c]! += x[r]! * x[c]!;
    }
    this.samples++;
  }

  /** Another vehicle's (or piece's) sums added to these. */
  merge(o: RoadLoadFit): void {
    for (let i = 0; i < 16; i++) this.xtx[i]! += o.xtx[i]!;
    for (let i = 0; i < 4; i++) this.xty[i]! += o.xty[i]!;
    this.samples += o.samples;
  }

  /** The fit, or null with too few samples, too steady a drive, a singular system or a mass outside RANGE. */
  result(): RoadLoadEstimate | null {
    if (this.samples < MIN_SAMPLES) return null;
    // Σa² and Σa from the sums (the second regressor is the constant g).
    const n = this.samples;
    const meanA = this.xtx[1 * 4 + 2]! / G_MS2 / n;
    if (!(this.xtx[2 * 4 + 2]! / n - meanA * meanA >= MIN_ACCEL_SD ** 2)) return null;
    const b = solve4(this.xtx, this.xty);
    if (!b) return null;
    const [cda_m2, mCrr, mass_kg, aux_w] = b as [number, number, number, number];
    const crr = mCrr / mass_kg;
    const within = (x: number, [lo, hi]: readonly [number, number]) => x >= lo && x <= hi;
    if (!within(mass_kg, RANGE.mass_kg)) return null;
    return {
      mass_kg,
      cda_m2: within(cda_m2, RANGE.cda_m2) ? cda_m2 : null,
      crr: within(crr, RANGE.crr) ? crr : null,
      aux_kw: aux_w / 1000,
      samples: this.samples,
    };
  }
}

/** Gaussian elimination with partial pivoting of a 4×4 system; null when (nearly) singular. */
function solve4(a0: Float64Array, b0: Float64Array): number[] | null {
  const a = Array.from({ length: 4 }, (_, r) => [...a0.subarray(r * 4, r * 4 + 4), b0[r]!]);
  const scale = Math.max(...a0.map(Math.abs));
  for (let c = 0; c < 4; c++) {
    let p = c;
    for (let r = c + 1; r < 4; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[p]![c]!)) p = r;
    if (!(Math.abs(a[p]![c]!) > scale * 1e-14)) return null;
    [a[c], a[p]] = [a[p]!, a[c]!];
    for (let r = c + 1; r < 4; r++) {
      const f = a[r]![c]! / a[c]![c]!;
      for (let k = c; k < 5; k++) a[r]![k]! -= f * a[c]![k]!;
    }
  }
  const x = [0, 0, 0, 0];
  for (let r = 3; r >= 0; r--) {
    let s = a[r]![4]!;
    for (let k = r + 1; k < 4; k++) s -= a[r]![k]! * x[k]!;
    x[r] = s / a[r]![r]!;
  }
  return x;
}
