/**
 * Measured against predicted: a bump-steer rig file (shared/io/rig-measurement.ts)
 * compared with the corner sweep of the design at the measured travels.
 *
 * The corner is solved at every distinct measured travel (and on an even
 * grid over the measured range, for the predicted curve), at one rack
 * position (0 unless given), by the same continuation sweep as every other
 * kinematics result. Differences are measured − predicted, per point, in
 * degrees; the RMS, the mean and the largest difference (with the travel
 * and file line where it occurs) are reported for toe and, when measured,
 * camber. A largest |difference| at or above the team's rig tolerance is a
 * `rig-toe-disagreement` / `rig-camber-disagreement` caution
 * (docs/cautions.md). docs/rig-measurements.md gives the math.
 */
import * as z from 'zod';
import { InputError, SolveError, parseOrThrow } from '../errors.js';
import { cornerDocumentSchema, type Corner } from '../schema/corner.js';
import { INTENT_RANGES } from '../schema/ranges.js';
import { inRange } from '../schema/ranged.js';
import { compileCorner, type Side } from '../kinematics/model.js';
import { CornerSolver } from '../kinematics/solver.js';
import { poseRow } from '../kinematics/pose.js';
import { checkRack, sweepTravels } from '../kinematics/sweep.js';
import { assertFinite } from '../kinematics/api.js';
import { SAFETY_CAUTION, SI_FIGURES, type Caution, type CautionFigures } from '../cautions/cautions.js';
import { cautionFigures, figureUnits } from '../cautions/figures.js';
import { RIG_BOUNDS, RIG_LIMITS, type RigPoint } from '../io/rig-measurement.js';

/** Largest |measured − predicted| a team accepts before a caution, deg. */
export interface RigTolerance {
  toeDeg: number;
  camberDeg: number;
}

/**
 * Product defaults, replaced by the team's own setting. Toe: the lower end
 * of the usual alignment tolerance of ±0.1–0.2° (check-values.md, common
 * practice). Camber: alignment specs hold camber more loosely, about
 * ±0.25–0.5° (from memory); the lower end is taken.
 */
export const DEFAULT_RIG_TOLERANCE: Readonly<RigTolerance> = { toeDeg: 0.1, camberDeg: 0.25 };

export const RIG_TOLERANCE_BASIS =
  "the team's rig tolerance (product default: toe 0.1°, the lower end of the usual ±0.1–0.2° alignment tolerance, common practice; camber 0.25°, from memory: alignment specs hold camber to about ±0.25–0.5°)";

/**
 * `absolute`: the values as measured and as predicted. `change`: each series
 * minus its own value at design height (travel 0; the measured value there
 * interpolated linearly), so a static toe or camber offset of the rig set-up
 * drops out and only the bump steer and camber change are compared.
 */
export const RIG_BASES = ['change', 'absolute'] as const;
export type RigBasis = (typeof RIG_BASES)[number];

export interface RigCompareOptions {
  /** Rack position of the prediction, mm (default 0). */
  rackMm?: number | undefined;
  /** Which wheel was on the rig; the right corner is the mirror (toe and camber keep their signs). Default left. */
  side?: Side | undefined;
  basis?: RigBasis | undefined;
  tolerance?: RigTolerance | undefined;
  /** How the cautions write their figures (the reader's unit system, shared/cautions/figures.ts); default SI. */
  figures?: CautionFigures | undefined;
}

export interface RigStats {
  /** √(mean of d²), deg, with d = measured − predicted. */
  rmsDeg: number;
  /** Mean of d, deg (a steady offset shows here). */
  meanDeg: number;
  /** The d of largest magnitude, deg (signed). */
  largestDeg: number;
  /** Travel and file line of that point. */
  atTravelMm: number;
  atLine: number;
}

export interface RigComparedPoint {
  line: number;
  travelMm: number;
  toe: { measuredDeg: number; predictedDeg: number; differenceDeg: number };
  camber: { measuredDeg: number; predictedDeg: number; differenceDeg: number } | null;
}

export interface RigComparison {
  basis: RigBasis;
  rackMm: number;
  side: Side;
  /** Every measured point in file order, with the prediction at its travel. */
  points: RigComparedPoint[];
  /** The predicted curve over the measured range, sorted by travel (in the same basis). */
  predicted: { travelMm: number; toeDeg: number; camberDeg: number }[];
  /** What `change` removed: each series' value at design height, deg (null in `absolute`). */
  atDesign: { measuredToeDeg: number; predictedToeDeg: number; measuredCamberDeg: number | null; predictedCamberDeg: number } | null;
  toe: RigStats;
  camber: RigStats | null;
  tolerance: RigTolerance;
  /** Disagreement cautions (empty when within tolerance). */
  cautions: Caution[];
  safetyNotice: string;
}

/** Grid points of the predicted curve over the measured range. */
const CURVE_POINTS = 41;

/** Linear interpolation of a series at x over sorted distinct abscissae; null outside the range. */
function interpolate(xs: number[], ys: number[], x: number): number | null {
  if (x < xs[0]! || x > xs[xs.length - 1]!) return null;
  for (let i = 0; i < xs.length - 1; i++) {
    if (x <= xs[i + 1]!) {
      const t = (x - xs[i]!) / (xs[i + 1]! - xs[i]!);
      return ys[i]! + t * (ys[i + 1]! - ys[i]!);
    }
  }
  return ys[ys.length - 1]!;
}

/** Distinct travels (sorted) with the mean of each measured series at each. */
function meanByTravel(points: RigPoint[], value: (p: RigPoint) => number): { xs: number[]; ys: number[] } {
  const groups = new Map<number, number[]>();
  for (const p of points) {
    const g = groups.get(p.travelMm) ?? [];
    g.push(value(p));
    groups.set(p.travelMm, g);
  }
  const xs = [...groups.keys()].sort((a, b) => a - b);
  return { xs, ys: xs.map((x) => groups.get(x)!.reduce((s, v) => s + v, 0) / groups.get(x)!.length) };
}

function stats(points: RigComparedPoint[], pick: (p: RigComparedPoint) => number): RigStats {
  let sum = 0;
  let sq = 0;
  let worst = points[0]!;
  for (const p of points) {
    const d = pick(p);
    sum += d;
    sq += d * d;
    if (Math.abs(d) > Math.abs(pick(worst))) worst = p;
  }
  return { rmsDeg: Math.sqrt(sq / points.length), meanDeg: sum / points.length, largestDeg: pick(worst), atTravelMm: worst.travelMm, atLine: worst.line };
}

const fmt = (x: number, d = 3) => x.toFixed(d);

function disagreement(code: 'rig-toe-disagreement' | 'rig-camber-disagreement', what: string, s: RigStats, tolerance: number, figures: CautionFigures): Caution | null {
  const value = Math.abs(s.largestDeg);
  if (!(value >= tolerance)) return null;
  return {
    level: 'warning',
    code,
    message:
      `Measured ${what} differs from the prediction by up to ${fmt(s.largestDeg)}° (at ${figures.length(s.atTravelMm, 1)} travel, line ${s.atLine}; RMS ${fmt(s.rmsDeg)}°), ` +
      `at or above the team's rig tolerance of ${fmt(tolerance)}°: check the rig set-up and the built hardpoints against the design before trusting the predicted figures.`,
    value,
    threshold: tolerance,
    unit: 'deg',
    basis: RIG_TOLERANCE_BASIS,
  };
}

/**
 * Compares measured rig points with the design's predicted toe and camber.
 * Errors: InputError for no points, a rack outside the stroke, or `change`
 * when the measured travels do not span 0; SolveError (`unreachable_pose`,
 * with the travel and the file line) when the design cannot reach a measured
 * travel. Never NaN.
 */
export function compareRigMeasurement(corner: Corner, measured: readonly RigPoint[], options: RigCompareOptions = {}): RigComparison {
  const basis = options.basis ?? 'change';
  const rackMm = options.rackMm ?? 0;
  const side = options.side ?? 'left';
  const tolerance = options.tolerance ?? DEFAULT_RIG_TOLERANCE;
  if (measured.length === 0) throw new InputError('points: the measurement has no points', [{ path: 'points', message: 'no points' }]);
  for (const [k, v] of Object.entries(tolerance)) {
    if (!(Number.isFinite(v) && v > 0)) throw new InputError(`tolerance.${k}: must be a positive number`, [{ path: `tolerance.${k}`, message: 'must be positive' }]);
  }
  const pts = [...measured];
  const hasCamber = pts.every((p) => p.camberDeg !== null);
  pts.forEach((p, i) => {
    if (![p.travelMm, p.toeDeg, p.camberDeg ?? 0].every(Number.isFinite)) {
      throw new InputError(`points[${i}]: line ${p.line} holds a value that is not a finite number`, [{ path: `points[${i}]`, message: 'not finite' }]);
    }
  });
  const model = compileCorner(corner);
  checkRack(model, [rackMm], 'rackMm');

  const lo = Math.min(...pts.map((p) => p.travelMm));
  const hi = Math.max(...pts.map((p) => p.travelMm));
  if (basis === 'change' && (lo > 0 || hi < 0)) {
    throw new InputError(`basis: the measured travels (${lo} to ${hi} mm) do not span design height (0 mm), so there is no value to take the change from; compare absolute values instead`, [
      { path: 'basis', message: 'measured travels do not span 0 mm' },
    ]);
  }
  const wanted = new Set<number>(pts.map((p) => p.travelMm));
  if (hi > lo) for (let i = 0; i < CURVE_POINTS; i++) wanted.add(lo + ((hi - lo) * i) / (CURVE_POINTS - 1));
  if (basis === 'change') wanted.add(0);
  const travels = [...wanted].sort((a, b) => a - b);

  const solver = new CornerSolver(model, side);
  const rows = new Array<{ toeDeg: number; camberDeg: number }>(travels.length);
  try {
    sweepTravels(solver, travels, rackMm, (i) => {
      const r = poseRow(solver);
      rows[i] = { toeDeg: r.toeDeg, camberDeg: r.camberDeg };
    });
  } catch (e) {
    if (!(e instanceof SolveError)) throw e;
    const at = typeof e.details['travelMm'] === 'number' ? e.details['travelMm'] : null;
    const beyond = at === null ? null : at >= 0 ? pts.reduce((a, b) => (b.travelMm > a.travelMm ? b : a)) : pts.reduce((a, b) => (b.travelMm < a.travelMm ? b : a));
    throw new SolveError(
      'unreachable_pose',
      `The design cannot reach the measured travel${beyond ? ` of ${beyond.travelMm} mm (line ${beyond.line})` : ''} at rack ${rackMm} mm: ${e.message}. ` +
        'The rig file goes beyond the travel the hardpoints allow; check the travel unit and sign, or the design.',
      { ...e.details, ...(beyond ? { measuredTravelMm: beyond.travelMm, line: beyond.line } : {}) },
    );
  }
  const byTravel = new Map<number, { toeDeg: number; camberDeg: number }>();
  travels.forEach((t, i) => byTravel.set(t, rows[i]!));

  let atDesign: RigComparison['atDesign'] = null;
  let shift = { mToe: 0, pToe: 0, mCamber: 0, pCamber: 0 };
  if (basis === 'change') {
    const toeSeries = meanByTravel(pts, (p) => p.toeDeg);
    const mToe = interpolate(toeSeries.xs, toeSeries.ys, 0)!;
    const camSeries = hasCamber ? meanByTravel(pts, (p) => p.camberDeg!) : null;
    const mCamber = camSeries ? interpolate(camSeries.xs, camSeries.ys, 0)! : null;
    const p0 = byTravel.get(0)!;
    atDesign = { measuredToeDeg: mToe, predictedToeDeg: p0.toeDeg, measuredCamberDeg: mCamber, predictedCamberDeg: p0.camberDeg };
    shift = { mToe, pToe: p0.toeDeg, mCamber: mCamber ?? 0, pCamber: p0.camberDeg };
  }

  const points: RigComparedPoint[] = pts.map((p) => {
    const pred = byTravel.get(p.travelMm)!;
    const mt = p.toeDeg - shift.mToe;
    const pt = pred.toeDeg - shift.pToe;
    const pc = pred.camberDeg - shift.pCamber;
    return {
      line: p.line,
      travelMm: p.travelMm,
      toe: { measuredDeg: mt, predictedDeg: pt, differenceDeg: mt - pt },
      camber: hasCamber ? { measuredDeg: p.camberDeg! - shift.mCamber, predictedDeg: pc, differenceDeg: p.camberDeg! - shift.mCamber - pc } : null,
    };
  });
  const predicted = travels.map((t) => ({ travelMm: t, toeDeg: byTravel.get(t)!.toeDeg - shift.pToe, camberDeg: byTravel.get(t)!.camberDeg - shift.pCamber }));
  const toe = stats(points, (p) => p.toe.differenceDeg);
  const camber = hasCamber ? stats(points, (p) => p.camber!.differenceDeg) : null;
  const figures = options.figures ?? SI_FIGURES;
  const cautions = [disagreement('rig-toe-disagreement', 'toe', toe, tolerance.toeDeg, figures), camber ? disagreement('rig-camber-disagreement', 'camber', camber, tolerance.camberDeg, figures) : null].filter(
    (c): c is Caution => c !== null,
  );
  const result: RigComparison = { basis, rackMm, side, points, predicted, atDesign, toe, camber, tolerance: { ...tolerance }, cautions, safetyNotice: SAFETY_CAUTION };
  assertFinite(result);
  return result;
}

const finite = z.number().finite();

/** Rig tolerance as a team sets it: positive, at most 5° (a larger one would never caution). */
export const rigToleranceSchema = z.strictObject({
  toeDeg: finite.positive().max(5),
  camberDeg: finite.positive().max(5),
});

/** `POST /api/compute/rig-compare` and the worker task: a corner, measured points in Rollwise conventions, options. */
export const rigCompareRequestSchema = z.strictObject({
  corner: cornerDocumentSchema,
  points: z
    .array(
      z.strictObject({
        travelMm: finite.min(-RIG_BOUNDS.travelMm).max(RIG_BOUNDS.travelMm),
        toeDeg: finite.min(-RIG_BOUNDS.toeDeg).max(RIG_BOUNDS.toeDeg),
        camberDeg: finite.min(-RIG_BOUNDS.camberDeg).max(RIG_BOUNDS.camberDeg).nullable().optional(),
        /** File line (default: the point's position + 1). */
        line: z.number().int().positive().optional(),
      }),
    )
    .min(RIG_LIMITS.minRows)
    .max(RIG_LIMITS.maxRows),
  rackMm: inRange(z.number().finite(), INTENT_RANGES.rackPositionMm, 'rackMm').optional(),
  side: z.enum(['left', 'right']).optional(),
  basis: z.enum(RIG_BASES).optional(),
  tolerance: rigToleranceSchema.optional(),
  /** The unit system the cautions write their figures in (default SI); the numbers of the answer stay SI. */
  units: z.enum(['si', 'imperial']).optional(),
});

/** Validated entry point for the worker pool and the compute API. */
export function computeRigComparison(input: unknown): RigComparison {
  const req = parseOrThrow(rigCompareRequestSchema, input, 'rig-compare request');
  const points: RigPoint[] = req.points.map((p, i) => ({ travelMm: p.travelMm, toeDeg: p.toeDeg, camberDeg: p.camberDeg ?? null, line: p.line ?? i + 1 }));
  return compareRigMeasurement(req.corner, points, { rackMm: req.rackMm, side: req.side, basis: req.basis, tolerance: req.tolerance, figures: cautionFigures(figureUnits(req.units ?? 'si')) });
}
