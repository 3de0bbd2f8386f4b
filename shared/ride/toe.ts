/**
 * Wheel travel → toe through the verified kinematics (docs/ride.md §3): the
 * full pose solver at a rack position for either wheel of the axle (the right
 * wheel as the mirror of the left corner), so a curved toe line counts where
 * it matters:
 *  - random roads: E[Δtoe²] over a Gaussian wheel travel by 9-point
 *    Gauss–Hermite quadrature on the toe curve itself (exact for a toe curve
 *    up to degree 8 in travel);
 *  - events: a table of the toe curve over the travel the event reaches,
 *    interpolated linearly (1 mm spacing or finer).
 */
import type { Corner } from '../schema/corner.js';
import { SolveError } from '../errors.js';
import { compileCorner, CornerSolver, poseRow, sweepTravels, type Side } from '../kinematics/index.js';

/** Nodes and weights of the probabilists' Gauss–Hermite rule, 9 points (weights sum to 1). */
export const GH_NODES = [-4.512745863399783, -3.20542900285647, -2.07684797867783, -1.0232556637891326, 0, 1.0232556637891326, 2.07684797867783, 3.20542900285647, 4.512745863399783];
export const GH_WEIGHTS = [
  2.2345844007746607e-5, 0.0027891413212317692, 0.04991640676521782, 0.24409750289493953, 0.40634920634920635, 0.24409750289493953, 0.04991640676521782,
  0.0027891413212317692, 2.2345844007746607e-5,
];

export interface ToeStatistics {
  /** RMS of the toe change from static toe, E[Δtoe²]^½, deg. */
  rmsDeg: number;
  /** Toe gradient at design height (analytic), deg/m of bump, toe-in positive. */
  gradientDegPerM: number;
  /** Equivalent gain rmsDeg/σ with the gradient's sign (statistical linearisation), deg/m. */
  equivalentGradientDegPerM: number;
  /** Largest |travel| the quadrature used, mm (clipped to the travel range when one is given). */
  reachMm: number;
}

/** The toe curve of one wheel at one rack position. */
export class ToeCurve {
  private readonly solver: CornerSolver;
  readonly staticToeDeg: number;
  readonly gradientDegPerM: number;

  constructor(
    readonly corner: Corner,
    readonly side: Side,
    readonly rackMm: number,
    private readonly travelRangeMm: [number, number] | null = null,
  ) {
    this.solver = new CornerSolver(compileCorner(corner), side);
    const t = this.at([0]);
    this.staticToeDeg = t.toe[0]!;
    this.gradientDegPerM = t.gradient[0]!;
  }

  private clip(s: number): number {
    if (!this.travelRangeMm) return s;
    return Math.min(this.travelRangeMm[1], Math.max(this.travelRangeMm[0], s));
  }

  /** Toe (deg) and toe gradient (deg/m) at ascending travels (mm); a pose out of reach is a SolveError naming the travel. */
  at(travelsMm: number[]): { toe: Float64Array; gradient: Float64Array } {
    const toe = new Float64Array(travelsMm.length);
    const gradient = new Float64Array(travelsMm.length);
    try {
      sweepTravels(this.solver, travelsMm, this.rackMm, (i) => {
        const r = poseRow(this.solver);
        toe[i] = r.toeDeg;
        gradient[i] = r.toeGradientDegPerM;
      });
    } catch (e) {
      if (e instanceof SolveError) {
        throw new SolveError(e.code, `${e.message} (the ride model needs the ${this.side} wheel's toe over ${travelsMm[0]!.toFixed(1)} to ${travelsMm[travelsMm.length - 1]!.toFixed(1)} mm of travel at rack ${this.rackMm.toFixed(1)} mm; give the suspension's travel range, travelRangeMm or --travel=DROOP:BUMP, to hold the wheel at its stops)`, e.details);
      }
      throw e;
    }
    return { toe, gradient };
  }

  /** Toe statistics for a Gaussian wheel travel of RMS σ (mm). */
  gaussian(sigmaMm: number): ToeStatistics {
    const travels = GH_NODES.map((x) => this.clip(x * sigmaMm));
    const { toe } = this.at(travels);
    let m2 = 0;
    for (let i = 0; i < GH_NODES.length; i++) {
      const d = toe[i]! - this.staticToeDeg;
      m2 += GH_WEIGHTS[i]! * d * d;
    }
    const rms = Math.sqrt(m2);
    const sign = this.gradientDegPerM < 0 ? -1 : 1;
    return {
      rmsDeg: rms,
      gradientDegPerM: this.gradientDegPerM,
      equivalentGradientDegPerM: sigmaMm > 0 ? (sign * rms) / (sigmaMm / 1000) : this.gradientDegPerM,
      reachMm: Math.max(Math.abs(travels[0]!), Math.abs(travels[travels.length - 1]!)),
    };
  }

  /**
   * A table of Δtoe (deg) over [fromMm, toMm] for linear interpolation: 21 points at least, spacing
   * ≤ 2 mm where that needs fewer than 201 (interpolation error ≤ κ·h²/8, below 1e-4° for
   * curvatures of a few hundred deg/m²).
   */
  table(fromMm: number, toMm: number): ToeTable {
    const lo = Math.min(0, fromMm);
    const hi = Math.max(0, toMm);
    const n = Math.min(201, Math.max(21, Math.ceil((hi - lo) / 2) + 1));
    const travels = new Array<number>(n);
    for (let i = 0; i < n; i++) travels[i] = lo + ((hi - lo) * i) / (n - 1);
    const { toe } = this.at(travels);
    for (let i = 0; i < n; i++) toe[i] = toe[i]! - this.staticToeDeg;
    return new ToeTable(lo, hi, toe);
  }
}

/** Δtoe(travel) sampled evenly, linear interpolation, deg. */
export class ToeTable {
  private readonly step: number;
  constructor(
    readonly fromMm: number,
    readonly toMm: number,
    private readonly values: Float64Array,
  ) {
    this.step = (toMm - fromMm) / (values.length - 1);
  }

  deltaToeDeg(travelMm: number): number {
    const n = this.values.length;
    if (!(this.step > 0)) return 0;
    let u = (travelMm - this.fromMm) / this.step;
    if (u <= 0) u = 0;
    if (u >= n - 1) u = n - 1 - 1e-12;
    const i = Math.floor(u);
    const f = u - i;
    return this.values[i]! * (1 - f) + this.values[i + 1]! * f;
  }
}
