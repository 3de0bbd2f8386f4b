/**
 * Corner sweeps: poses over a travel range at one or more steering inputs,
 * solved by continuation from the design pose (outward from the travel
 * nearest zero, predicted along the analytic pose tangent), with fits.
 */
import { InputError } from '../errors.js';
import type { Corner, Vec3 } from '../schema/corner.js';
import { compileCorner, type CornerModel, type Side } from './model.js';
import { CornerSolver } from './solver.js';
import { poseOutputs, poseRow, type PoseResult, type PoseRow } from './pose.js';
import { fitToeCamber, type ToeFit } from './fit.js';

export interface Range {
  from: number;
  to: number;
  step: number;
}

/** Largest pose count a library sweep accepts (the HTTP API caps lower). */
export const MAX_SWEEP_POINTS = 100_000;

/** Expands FROM:TO:STEP (inclusive of TO when it falls on a step) into values; InputError names `field`. */
export function expandRange(r: Range, field: string): number[] {
  const bad = (message: string): never => {
    throw new InputError(`${field}: ${message}`, [{ path: field, message }]);
  };
  if (![r.from, r.to, r.step].every(Number.isFinite)) bad('from, to and step must be finite numbers');
  if (r.to < r.from) bad(`to (${r.to}) must not be below from (${r.from})`);
  if (r.to > r.from && !(r.step > 0)) bad(`step must be positive, got ${r.step}`);
  if (r.to === r.from) return [r.from];
  const n = Math.floor((r.to - r.from) / r.step + 1e-9) + 1;
  if (n > MAX_SWEEP_POINTS) bad(`${n} points is more than ${MAX_SWEEP_POINTS}`);
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(r.from + i * r.step);
  return out;
}

/** Checks steering inputs against the corner's stroke (and that an unsteered corner gets only 0). */
export function checkRack(model: CornerModel, rackMm: number[], field: string): void {
  const [lo, hi] = model.rackStroke;
  rackMm.forEach((r, i) => {
    const path = `${field}[${i}]`;
    if (!Number.isFinite(r)) throw new InputError(`${path}: must be a finite number`, [{ path, message: 'not a finite number' }]);
    if (!model.corner.steered && r !== 0) {
      throw new InputError(`${path}: the corner is not steered (fixed toe link), so the rack position must be 0, got ${r}`, [{ path, message: 'corner not steered' }]);
    }
    if (r < lo - 1e-9 || r > hi + 1e-9) {
      throw new InputError(`${path}: rack ${r} mm is outside the steering stroke [${lo}, ${hi}] mm`, [{ path, message: `outside stroke [${lo}, ${hi}]` }]);
    }
  });
}

export type SweepRow = PoseRow;

export interface SweepFit extends ToeFit {
  rackMm: number;
  /** Travel range the fit used, mm. */
  fromMm: number;
  toMm: number;
  /** Analytic toe gradient at design height (travel 0), deg/m; null when 0 is outside the sweep. */
  toeGradientAtDesignDegPerM: number | null;
}

export interface SweepOptions {
  travel: Range;
  /** Steering inputs, mm (default [0]). */
  rackMm?: number[] | undefined;
  /** Travel window for the fits, mm (default: the whole sweep). */
  fitRange?: { fromMm: number; toMm: number } | undefined;
  side?: Side;
}

export interface SweepResult {
  rows: SweepRow[];
  /** Fit at rack 0 (or the first rack given), and each rack's fit in `byRack`. */
  fit: SweepFit & { byRack: SweepFit[] };
  diagnostics: { poses: number; iterations: number; iterationsPerPose: number };
}

/**
 * Solves one rack position's travel list by continuation: first the design
 * pose, then to the travel nearest 0, outward up, then outward down. Calls
 * `visit(index)` with the solver at each converged pose.
 */
export function sweepTravels(solver: CornerSolver, travels: number[], rackMm: number, visit: (index: number) => void): number {
  solver.reset();
  let iters = solver.solve(0, 0);
  let start = 0;
  for (let i = 1; i < travels.length; i++) if (Math.abs(travels[i]!) < Math.abs(travels[start]!)) start = i;
  iters += solver.solveTowards(travels[start]!, rackMm);
  visit(start);
  // The start pose (c, R, travel and steering tangents, lever angles), and the travel tangents of the
  // next three poses up, so the downward pass resumes with the predictor's memory.
  const keep = new Float64Array(9 + 3 + 6 + 6 + 18 + 4);
  const startTravel = solver.travelMm;
  keep.set(solver.levers, 42);
  keep.set(solver.R, 0);
  keep.set(solver.c, 9);
  keep.set(solver.tTravel, 12);
  keep.set(solver.tSteer, 18);
  for (let i = start + 1; i < travels.length; i++) {
    iters += solver.solveTowards(travels[i]!, rackMm);
    if (i - start <= 3) keep.set(solver.tTravel, 24 + 6 * (i - start - 1));
    visit(i);
  }
  solver.R.set(keep.subarray(0, 9));
  solver.c.set(keep.subarray(9, 12));
  solver.tTravel.set(keep.subarray(12, 18));
  solver.tSteer.set(keep.subarray(18, 24));
  solver.levers.set(keep.subarray(42, 46));
  solver.travelMm = startTravel;
  solver.rackMm = rackMm;
  solver.forgetHistory();
  for (let k = Math.min(3, travels.length - 1 - start); k >= 1; k--) solver.rememberTangent(travels[start + k]!, keep.subarray(18 + 6 * k, 24 + 6 * k));
  for (let i = start - 1; i >= 0; i--) {
    iters += solver.solveTowards(travels[i]!, rackMm);
    visit(i);
  }
  return iters;
}

/** Corner sweep over travel at each rack position, with per-rack fits. */
export function sweepCorner(corner: Corner, options: SweepOptions): SweepResult {
  const model = compileCorner(corner);
  const travels = expandRange(options.travel, 'travel');
  const racks = options.rackMm && options.rackMm.length ? options.rackMm : [0];
  checkRack(model, racks, 'rackMm');
  const solver = new CornerSolver(model, options.side ?? 'left');
  const rows: SweepRow[] = [];
  const fits: SweepFit[] = [];
  let iterations = 0;
  const fr = options.fitRange ?? { fromMm: travels[0]!, toMm: travels[travels.length - 1]! };
  for (const rack of racks) {
    const block = new Array<SweepRow>(travels.length);
    iterations += sweepTravels(solver, travels, rack, (i) => {
      block[i] = poseRow(solver);
    });
    // The rows in the fit window, as columns (one pass, no intermediate row arrays).
    const fx: number[] = [];
    const ftoe: number[] = [];
    const fcam: number[] = [];
    let design: SweepRow | undefined;
    for (let i = 0; i < block.length; i++) {
      const r = block[i]!;
      rows.push(r);
      if (r.travelMm === 0 && !design) design = r;
      if (r.travelMm >= fr.fromMm - 1e-9 && r.travelMm <= fr.toMm + 1e-9) {
        fx.push(r.travelMm);
        ftoe.push(r.toeDeg);
        fcam.push(r.camberDeg);
      }
    }
    if (fx.length < 3) {
      throw new InputError(`fitRange: needs at least three sweep points, found ${fx.length} in [${fr.fromMm}, ${fr.toMm}] mm`, [
        { path: 'fitRange', message: 'fewer than three points' },
      ]);
    }
    const f = fitToeCamber(fx, ftoe, fcam);
    fits.push({
      rackMm: rack,
      fromMm: fr.fromMm,
      toMm: fr.toMm,
      bumpSteerDegPerM: f.bumpSteerDegPerM,
      curvatureDegPerM2: f.curvatureDegPerM2,
      maxDeviationDeg: f.maxDeviationDeg,
      camberGainDegPerM: f.camberGainDegPerM,
      toeGradientAtDesignDegPerM: design ? design.toeGradientDegPerM : null,
    });
  }
  const main = fits.find((f) => f.rackMm === 0) ?? fits[0]!;
  return {
    rows,
    fit: { ...main, byRack: fits },
    diagnostics: { poses: rows.length, iterations, iterationsPerPose: iterations / rows.length },
  };
}

/** One pose; warm start from a previous pose's state when given, else continuation from the design pose. */
export function solvePose(corner: Corner, at: { travelMm: number; rackMm?: number; side?: Side }, warm?: PoseState): PoseResult & { state: PoseState } {
  const model = compileCorner(corner);
  const rack = at.rackMm ?? 0;
  if (!Number.isFinite(at.travelMm)) throw new InputError('travelMm: must be a finite number', [{ path: 'travelMm', message: 'not a finite number' }]);
  checkRack(model, [rack], 'rackMm');
  const s = new CornerSolver(model, at.side ?? 'left');
  if (warm) {
    s.c.set(warm.c);
    s.R.set(warm.R);
    s.travelMm = warm.travelMm;
    s.rackMm = warm.rackMm;
    s.forgetHistory();
    s.solve(warm.travelMm, warm.rackMm);
  } else s.solve(0, 0);
  s.solveTowards(at.travelMm, rack);
  const pose = poseOutputs(s);
  return { ...pose, state: { c: [s.c[0]!, s.c[1]!, s.c[2]!], R: Array.from(s.R), travelMm: at.travelMm, rackMm: rack } };
}

/** A solved pose's state (left frame), to warm-start a nearby solve. */
export interface PoseState {
  c: [number, number, number];
  R: number[];
  travelMm: number;
  rackMm: number;
}

/** Points carried by the upright (they move as one rigid body with it); five-link adds `link1Outer`…`link5Outer`. */
const UPRIGHT_POINTS: ReadonlySet<string> = new Set(['wheelCentre', 'spindle', 'lowerOuter', 'upperOuter', 'tieRodOuter', 'strutLower', 'link1Outer', 'link2Outer', 'link3Outer', 'link4Outer', 'link5Outer']);

/**
 * Every entry of `corner.points` at a solved pose (`solvePose(...).state`,
 * left frame), mm: upright points (wheel centre, spindle, outer joints, strut
 * lower point, link outers) at c + R·(p − wc₀), body points where they are,
 * and the tie-rod / toe-link inner point where the rack or steering arm puts
 * it for the pose's steering input. The one place that moves hardpoints with
 * a pose: drawings, joint articulation and the like read it.
 */
export function posedPoints(corner: Corner, pose: PoseState): Record<string, Vec3> {
  const model = compileCorner(corner);
  const s = new CornerSolver(model, 'left');
  s.place(pose);
  const steerInner = model.corner.type === 'five-link' ? `link${model.corner.toeLink}Inner` : 'tieRodInner';
  const wc0 = model.wc0;
  const c = s.c;
  const R = s.R;
  const out: Record<string, Vec3> = {};
  for (const [key, p] of Object.entries(model.corner.points as Record<string, Vec3>)) {
    if (UPRIGHT_POINTS.has(key)) {
      const d0 = p[0] - wc0[0];
      const d1 = p[1] - wc0[1];
      const d2 = p[2] - wc0[2];
      out[key] = [
        c[0]! + R[0]! * d0 + R[1]! * d1 + R[2]! * d2,
        c[1]! + R[3]! * d0 + R[4]! * d1 + R[5]! * d2,
        c[2]! + R[6]! * d0 + R[7]! * d1 + R[8]! * d2,
      ];
    } else if (key === steerInner) out[key] = [s.steerInner[0]!, s.steerInner[1]!, s.steerInner[2]!];
    else out[key] = [p[0], p[1], p[2]];
  }
  return out;
}

/** `posedPoints` at a travel and steering input, solved by continuation from the design pose. For drawing the linkage. */
export function posedHardpoints(corner: Corner, at: { travelMm: number; rackMm?: number }): Record<string, Vec3> {
  return posedPoints(corner, solvePose(corner, at).state);
}
