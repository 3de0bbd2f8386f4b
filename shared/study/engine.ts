/**
 * The per-sample engine of a study: the nominal axle solved once, then each
 * sample (a toleranced build, or a design variant) solved pose by pose with
 * the corner pose solver, each pose warm-started from the nominal design's
 * pose at the same travel and rack, corrected by how far the sample's
 * previous pose lay from its nominal one. Outputs follow shared/docs/domain.md
 * (toe-in positive, ε = −dδ̄/dφ, roll camber, roll centre in the body frame).
 *
 * A toleranced build keeps every link at its drawing length: the body
 * pickups and the upright's points move, so the assembled upright settles
 * elsewhere (static toe and camber change); the workshop then sets camber by
 * shims and toe by the tie-rod adjuster, each to its resolution. A design
 * variant moves points with the links made to fit (its design pose is
 * unchanged). Spring, rocker and bar linkages are rebuilt on the moved
 * points in both cases.
 */
import { InputError, SolveError } from '../errors.js';
import type { Corner, Vec3 } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { compileCorner, moveCornerPoints, CornerSolver, poseRow, polyFit, frontViewIc, rollCentreOf, checkRack, type CornerModel, type PoseRow, type FrontViewIc } from '../kinematics/index.js';
import { RAD } from '../kinematics/vec.js';
import { linkVehicle, type LinkedVehicle } from '../balance/link.js';
import { balanceCore, understeerBudget } from '../balance/understeer.js';
import { resolveTrackProfile, type TrackProfile } from '../intent/profiles.js';
import { thresholdsFor, CAUTION_RULES, type CautionThresholds, type LevelThresholds } from '../intent/cautions.js';
import { FIXED_POINTS, type StudySpec, type Tolerance } from './schema.js';

// ---------- outputs ----------

export interface OutputBreachRule {
  code: keyof typeof CAUTION_RULES;
  /** The rule compares |value| (true) or the signed value. */
  absolute: boolean;
  thresholds: LevelThresholds;
}

export interface OutputDefinition {
  key: string;
  label: string;
  unit: string;
  breach?: OutputBreachRule;
}

/** Pose kinds of a side's pose list. */
const P_STATIC = 0;
const P_ZERO = 1; // travel 0 at a rack position
const P_BUMP = 2; // the profile's single-wheel bump at a rack position
const P_GRID = 3; // a point of the bump-steer fit
const P_ROLL = 4; // the roll sweep

interface PoseDef {
  kind: number;
  travelMm: number;
  rackMm: number;
  /** Rack block (index into racks) or roll sign (+1 / −1). */
  tag: number;
  /** Grid index within the rack block (P_GRID). */
  grid: number;
}

/** Point moves of one corner (left frame), mm, as absolute positions. */
export type PointMoves = Record<string, Vec3>;

/** One factor of the sampled inputs: a tolerance coordinate of one side, or a swept coordinate. */
export interface FactorInfo {
  key: string;
  label: string;
  /** Index into spec.tolerances or spec.factors. */
  source: number;
  side: 'left' | 'right' | 'both';
  axis: 'x' | 'y' | 'z';
}

export interface SampleOutcome {
  /** One value per output definition; NaN where not defined (e.g. a roll centre at infinity). */
  values: Float64Array;
  poses: number;
  error: string | null;
}

const AXIS_INDEX = { x: 0, y: 1, z: 2 } as const;

function toeOf(s: CornerSolver): number {
  // poseRow's toe (toe-in positive) from the spin axis a = R·a0, without building the whole row.
  const R = s.R;
  const a0 = s.model.spin0;
  const ax = R[0]! * a0[0] + R[1]! * a0[1] + R[2]! * a0[2];
  const ay = R[3]! * a0[0] + R[4]! * a0[1] + R[5]! * a0[2];
  return -Math.atan2(-ax, ay) * RAD;
}

/** Everything of a study that does not change between samples. */
export class StudyModel {
  readonly corner: Corner;
  readonly model: CornerModel;
  readonly profile: TrackProfile;
  readonly racks: number[];
  readonly travels: number[];
  readonly outputs: OutputDefinition[];
  readonly factors: FactorInfo[];
  readonly linked: LinkedVehicle | null;
  readonly nominalK: number | null;
  readonly halfTrackMm: number;
  readonly leftPoses: PoseDef[];
  readonly rightPoses: PoseDef[];
  /** Nominal pose states: c (3) and R (9) per pose. */
  private readonly nomL: Float64Array;
  private readonly nomR: Float64Array;
  private readonly nominalStatic: { toeDeg: number; camberDeg: number };
  private readonly setupSens: { camberPerShim: number; toePerShim: number; toePerLength: number } | null;
  private readonly D = new Float64Array(9);
  private readonly fitX: Float64Array;
  private readonly fitY: Float64Array;
  /** Output index by key. */
  readonly index: Record<string, number> = {};

  constructor(readonly spec: StudySpec) {
    this.corner = compileCorner(spec.corner).corner;
    this.model = compileCorner(this.corner);
    this.profile = resolveTrackProfile(spec.trackProfile);
    const a = spec.analysis;
    const [from, to] = a.travelMm ?? this.profile.travelMm;
    if (!(to > from)) throw new InputError('analysis.travelMm: the bump end must lie above the droop end', [{ path: 'analysis.travelMm', message: 'bump end not above droop end' }]);
    const n = a.travelPoints;
    this.travels = Array.from({ length: n }, (_, i) => from + ((to - from) * i) / (n - 1));
    const racks = [0, ...a.rackMm.filter((r) => r !== 0)];
    this.racks = [...new Set(racks)];
    if (!this.corner.steered && this.racks.length > 1) {
      throw new InputError('analysis.rackMm: the corner is not steered (fixed toe link), so only rack 0 applies', [{ path: 'analysis.rackMm', message: 'corner not steered' }]);
    }
    checkRack(this.model, this.racks, 'analysis.rackMm');
    this.halfTrackMm = this.model.cp0[1];
    this.checkPoints(spec);
    if (spec.kind === 'tolerance' && spec.setup.camberShimMm !== undefined && this.corner.type === 'five-link') {
      throw new InputError('setup.camberShimMm: a five-link corner has no camber shims in this model; leave camber set-up out', [{ path: 'setup.camberShimMm', message: 'not available on a five-link corner' }]);
    }
    this.factors = this.buildFactors(spec);
    this.outputs = this.buildOutputs(spec);
    this.outputs.forEach((o, i) => (this.index[o.key] = i));

    // Poses: static, then per rack: travel 0, the bump, the fit grid outward from design; then the roll sweep.
    const left: PoseDef[] = [{ kind: P_STATIC, travelMm: 0, rackMm: 0, tag: 0, grid: 0 }];
    let start = 0;
    for (let i = 1; i < n; i++) if (Math.abs(this.travels[i]!) < Math.abs(this.travels[start]!)) start = i;
    const order = [...Array.from({ length: n - start }, (_, i) => start + i), ...Array.from({ length: start }, (_, i) => start - 1 - i)];
    this.racks.forEach((r, k) => {
      left.push({ kind: P_ZERO, travelMm: 0, rackMm: r, tag: k, grid: 0 });
      left.push({ kind: P_BUMP, travelMm: this.profile.bumpHeightMm, rackMm: r, tag: k, grid: 0 });
      for (const g of order) left.push({ kind: P_GRID, travelMm: this.travels[g]!, rackMm: r, tag: k, grid: g });
    });
    const s = this.halfTrackMm * Math.sin(a.rollDeg / RAD);
    // Roll φ > 0 (right side down): left travel −s, right +s (domain.md).
    left.push({ kind: P_ROLL, travelMm: -s, rackMm: 0, tag: 1, grid: 0 }, { kind: P_ROLL, travelMm: s, rackMm: 0, tag: -1, grid: 0 });
    const right: PoseDef[] = [
      { kind: P_STATIC, travelMm: 0, rackMm: 0, tag: 0, grid: 0 },
      { kind: P_ROLL, travelMm: s, rackMm: 0, tag: 1, grid: 0 },
      { kind: P_ROLL, travelMm: -s, rackMm: 0, tag: -1, grid: 0 },
    ];
    this.leftPoses = left;
    this.rightPoses = right;
    this.fitX = new Float64Array(n);
    for (let i = 0; i < n; i++) this.fitX[i] = this.travels[i]! / 1000;
    this.fitY = new Float64Array(n);

    this.nomL = this.solveNominal(left, 'left');
    this.nomR = this.solveNominal(right, 'right');
    const st = new CornerSolver(this.model, 'left');
    st.solve(0, 0);
    const row = poseRow(st);
    this.nominalStatic = { toeDeg: row.toeDeg, camberDeg: row.camberDeg };
    this.setupSens = spec.kind === 'tolerance' && (spec.setup.camberShimMm !== undefined || spec.setup.toeAdjusterStepMm !== undefined) ? this.setupSensitivities() : null;

    if (spec.vehicle) {
      const c = spec.axle === 'front' ? { frontCorner: this.corner, rearCorner: spec.otherCorner as Corner | undefined } : { frontCorner: spec.otherCorner as Corner | undefined, rearCorner: this.corner };
      this.linked = linkVehicle({ vehicle: spec.vehicle as Vehicle, ...c }, {}, null);
      this.nominalK = understeerBudget(balanceCore(this.linked.vehicle)).understeerBudget.total;
    } else {
      this.linked = null;
      this.nominalK = null;
    }
  }

  private checkPoints(spec: StudySpec): void {
    const pts = this.corner.points as Record<string, Vec3>;
    const list = spec.kind === 'tolerance' ? spec.tolerances.map((t, i) => ({ p: t.point, path: `tolerances[${i}].point` })) : spec.factors.map((f, i) => ({ p: f.point, path: `factors[${i}].point` }));
    const seen = new Set<string>();
    for (const { p, path } of list) {
      if (!(p in pts)) throw new InputError(`${path}: "${p}" is not a point of this ${this.corner.type} corner (its points: ${Object.keys(pts).filter((k) => !FIXED_POINTS.includes(k)).join(', ')})`, [{ path, message: 'unknown point' }]);
      if (FIXED_POINTS.includes(p)) throw new InputError(`${path}: ${p} defines the wheel axis the upright's other points are measured from; give tolerances or bounds to the other points`, [{ path, message: 'fixed point' }]);
    }
    if (spec.kind === 'sweep') {
      spec.factors.forEach((f, i) => {
        const key = `${f.point}.${f.axis}`;
        if (seen.has(key)) throw new InputError(`factors[${i}]: ${key} is swept twice`, [{ path: `factors[${i}]`, message: 'repeated factor' }]);
        seen.add(key);
        if (!(f.toMm > f.fromMm)) throw new InputError(`factors[${i}].toMm must be above fromMm`, [{ path: `factors[${i}].toMm`, message: 'not above fromMm' }]);
      });
    }
  }

  private buildFactors(spec: StudySpec): FactorInfo[] {
    const out: FactorInfo[] = [];
    if (spec.kind === 'sweep') {
      spec.factors.forEach((f, i) => out.push({ key: `${f.point}.${f.axis}`, label: `${f.point} ${f.axis}`, source: i, side: 'both', axis: f.axis }));
      return out;
    }
    const sides: ('left' | 'right')[] = spec.sides === 'both' ? ['left', 'right'] : ['left'];
    for (const side of sides) {
      spec.tolerances.forEach((t, i) => {
        const axes: ('x' | 'y' | 'z')[] = t.axis === 'sphere' ? ['x', 'y', 'z'] : [t.axis];
        for (const ax of axes) out.push({ key: `${side}.${t.point}.${ax}`, label: `${t.point} ${ax} (${side})`, source: i, side, axis: ax });
      });
    }
    return out;
  }

  private buildOutputs(spec: StudySpec): OutputDefinition[] {
    const p = this.profile.id;
    const th: CautionThresholds = (spec.cautionThresholds ?? {}) as CautionThresholds;
    const rule = (code: keyof typeof CAUTION_RULES, absolute: boolean): OutputBreachRule => ({ code, absolute, thresholds: thresholdsFor(code, p, th) });
    const o: OutputDefinition[] = [
      { key: 'staticToeDeg', label: 'Static toe (left)', unit: 'deg' },
      { key: 'staticCamberDeg', label: 'Static camber (left)', unit: 'deg' },
      { key: 'bumpSteerDegPerM', label: 'Bump-steer gradient', unit: 'deg/m' },
      { key: 'bumpSteerCurvatureDegPerM2', label: 'Bump-steer curvature', unit: 'deg/m²' },
    ];
    for (const r of this.racks.slice(1)) o.push({ key: `bumpSteerDegPerM@${r}`, label: `Bump-steer gradient at rack ${r} mm`, unit: 'deg/m' });
    if (this.racks.length > 1) o.push({ key: 'lockBumpSteerSpreadDegPerM', label: 'Bump-steer spread across the rack positions', unit: 'deg/m', breach: rule('lock-bump-steer-spread', true) });
    const eps: OutputDefinition = { key: 'rollSteerCoefficient', label: 'Roll steer ε', unit: 'deg/deg' };
    if (spec.axle === 'front' && this.corner.steered) eps.breach = rule('front-roll-steer-feel', true);
    else if (spec.axle === 'rear') eps.breach = rule('rear-roll-oversteer', false);
    if (this.profile.longTravel) eps.breach = rule('long-travel-roll-steer', true);
    o.push(
      eps,
      { key: 'rollSteerSecantDegPerDeg', label: `Roll steer over ±${spec.analysis.rollDeg}° of roll`, unit: 'deg/deg' },
      { key: 'rollCamberDegPerDeg', label: 'Roll camber', unit: 'deg/deg' },
      { key: 'rollCentreHeightMm', label: 'Roll centre height', unit: 'mm' },
      { key: 'rollCentreHeightAtRollMm', label: `Roll centre height at ${spec.analysis.rollDeg}° of roll`, unit: 'mm' },
      { key: 'bumpToeChangeDeg', label: `Bump cost: toe change over a ${this.profile.bumpHeightMm} mm single-wheel bump (${this.profile.label.toLowerCase()})`, unit: 'deg', breach: rule('bump-toe-change', true) },
      { key: 'bumpScrubMm', label: 'Contact-patch scrub over that bump', unit: 'mm', breach: rule('bump-lateral-scrub', true) },
    );
    if (spec.vehicle) o.push({ key: 'understeerGradientChangeDegPerG', label: 'Understeer-gradient change with the vehicle', unit: 'deg/g' });
    if (spec.kind === 'sweep') o.push({ key: 'balanceGainDegPerG', label: `Balance gained (${spec.balanceDirection === 'more-understeer' ? 'toward understeer' : 'toward oversteer'})`, unit: 'deg/g' });
    return o;
  }

  private solveNominal(poses: PoseDef[], side: 'left' | 'right'): Float64Array {
    const s = new CornerSolver(this.model, side);
    const out = new Float64Array(12 * poses.length);
    poses.forEach((p, k) => {
      s.reset();
      s.solve(0, 0);
      s.solveTowards(p.travelMm, p.rackMm);
      out.set(s.c, 12 * k);
      out.set(s.R, 12 * k + 3);
    });
    return out;
  }

  /** Toe and camber per mm of camber shim and toe per mm of tie-rod length, at the nominal design (central differences). */
  private setupSensitivities() {
    const h = 0.05;
    const at = (shim: number, dl: number) => {
      const m = this.buildModel(this.shimMoves({}, shim), true);
      m.lengths[m.steerRow]! += dl;
      const s = new CornerSolver(m, 'left');
      s.solve(0, 0);
      return { toe: toeOf(s), camber: poseRow(s).camberDeg };
    };
    const canShim = this.corner.type !== 'five-link';
    const sp = canShim ? at(h, 0) : null;
    const sm = canShim ? at(-h, 0) : null;
    const lp = at(0, h);
    const lm = at(0, -h);
    return {
      camberPerShim: sp && sm ? (sp.camber - sm.camber) / (2 * h) : 0,
      toePerShim: sp && sm ? (sp.toe - sm.toe) / (2 * h) : 0,
      toePerLength: (lp.toe - lm.toe) / (2 * h),
    };
  }

  /** Adds a camber shim (mm, outboard positive) to a set of moves: the upper-arm pickups (double wishbone) or the strut top (camber plate) move along y. */
  private shimMoves(moves: PointMoves, shim: number): PointMoves {
    if (shim === 0) return moves;
    const pts = this.corner.points as Record<string, Vec3>;
    const names = this.corner.type === 'double-wishbone' ? ['upperFront', 'upperRear'] : this.corner.type === 'strut' ? ['strutTop'] : [];
    const out = { ...moves };
    for (const n of names) {
      const p = out[n] ?? pts[n]!;
      out[n] = [p[0], p[1] + shim, p[2]];
    }
    return out;
  }

  /** The model of a moved corner; `build`: links keep their drawing lengths (a toleranced build), else they fit the moved points (a design variant). */
  buildModel(moves: PointMoves, build: boolean): CornerModel {
    if (Object.keys(moves).length === 0) {
      if (!build) return this.model;
      const c = moveCornerPoints(this.corner, {});
      return compileCorner(c);
    }
    const m = compileCorner(moveCornerPoints(this.corner, { points: moves }));
    if (build) m.lengths.set(this.model.lengths);
    return m;
  }

  /** Sets the solver to the nominal state of pose k, moved by the sample's offset at pose `prev` (the solver's current state). */
  private warm(s: CornerSolver, nom: Float64Array, k: number, prev: number): void {
    const c = s.c;
    const R = s.R;
    const o = 12 * k;
    if (prev < 0) {
      for (let i = 0; i < 3; i++) c[i] = nom[o + i]!;
      for (let i = 0; i < 9; i++) R[i] = nom[o + 3 + i]!;
      return;
    }
    const q = 12 * prev;
    // D = R_sample(prev) · R_nominal(prev)ᵀ, then R = D · R_nominal(k), c = c_nominal(k) + (c_sample(prev) − c_nominal(prev)).
    const D = this.D;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        D[3 * i + j] = R[3 * i]! * nom[q + 3 + 3 * j]! + R[3 * i + 1]! * nom[q + 3 + 3 * j + 1]! + R[3 * i + 2]! * nom[q + 3 + 3 * j + 2]!;
      }
    }
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) R[3 * i + j] = D[3 * i]! * nom[o + 3 + j]! + D[3 * i + 1]! * nom[o + 3 + 3 + j]! + D[3 * i + 2]! * nom[o + 3 + 6 + j]!;
    }
    for (let i = 0; i < 3; i++) c[i] = nom[o + i]! + c[i]! - nom[q + i]!;
  }

  /** Static pose of a side from the nominal start; returns Newton solves used. */
  private solveStatic(s: CornerSolver, nom: Float64Array): void {
    this.warm(s, nom, 0, -1);
    s.solve(0, 0);
  }

  /**
   * One sample. `left` and `right` are the moves of each corner (left frame);
   * `build` says whether links keep their drawing lengths. Never throws for
   * unsolvable geometry: the outcome carries the message instead.
   */
  evaluate(left: PointMoves, right: PointMoves | null, build: boolean, out: Float64Array): SampleOutcome {
    out.fill(NaN);
    let poses = 0;
    try {
      const setup = this.spec.kind === 'tolerance' ? this.spec.setup : null;
      const side = (moves: PointMoves, which: 'left' | 'right'): { s: CornerSolver; row: PoseRow } => {
        let m = this.buildModel(moves, build);
        let s = new CornerSolver(m, which);
        const nom = which === 'left' ? this.nomL : this.nomR;
        this.solveStatic(s, nom);
        poses++;
        if (setup && this.setupSens) {
          const sens = this.setupSens;
          const shimStep = setup.camberShimMm;
          if (shimStep !== undefined && sens.camberPerShim !== 0) {
            const cam = poseRow(s).camberDeg;
            let shim = -(cam - this.nominalStatic.camberDeg) / sens.camberPerShim;
            if (shimStep > 0) shim = Math.round(shim / shimStep) * shimStep;
            if (shim !== 0) {
              m = this.buildModel(this.shimMoves(moves, shim), build);
              s = new CornerSolver(m, which);
              this.solveStatic(s, nom);
              poses++;
            }
          }
          const toeStep = setup.toeAdjusterStepMm;
          if (toeStep !== undefined && sens.toePerLength !== 0) {
            let dl = -(toeOf(s) - this.nominalStatic.toeDeg) / sens.toePerLength;
            if (toeStep > 0) dl = Math.round(dl / toeStep) * toeStep;
            if (dl !== 0) {
              m.lengths[m.steerRow]! += dl;
              s.solve(0, 0);
              poses++;
            }
          }
        }
        return { s, row: poseRow(s) };
      };

      const L = side(left, 'left');
      const R = right === null ? null : side(right, 'right');
      const sl = L.s;
      const icL = frontViewIc(sl);
      let sr: CornerSolver;
      let rowR: PoseRow;
      if (R) {
        sr = R.s;
        rowR = R.row;
      } else {
        sr = new CornerSolver(this.model, 'right');
        this.solveStatic(sr, this.nomR);
        poses++;
        rowR = poseRow(sr);
      }
      const icR = frontViewIc(sr);
      const rowL = L.row;
      const idx = this.index;
      out[idx['staticToeDeg']!] = rowL.toeDeg;
      out[idx['staticCamberDeg']!] = rowL.camberDeg;
      const half = this.halfTrackMm;
      // ε = −dδ̄/dφ and roll camber at φ = 0 from the analytic gradients (as shared/kinematics rollSweep): ds/dφ = t/2 per rad, left −s, right +s.
      out[idx['rollSteerCoefficient']!] = -((rowL.toeGradientDegPerM + rowR.toeGradientDegPerM) / 2000) * half / RAD;
      out[idx['rollCamberDegPerDeg']!] = 1 + ((rowL.camberGradientDegPerM + rowR.camberGradientDegPerM) / 2000) * half / RAD;
      const rc = rollCentreOf(icL, icR);
      out[idx['rollCentreHeightMm']!] = rc ? rc.heightMm : NaN;

      // Left pose list (from index 1: the static pose is solved).
      const lp = this.leftPoses;
      const racks = this.racks;
      const zeroToe = new Float64Array(racks.length);
      const bumpToe = new Float64Array(racks.length);
      const grads = new Float64Array(racks.length);
      let bumpCpY = NaN;
      let steerRollL = NaN;
      let steerRollLm = NaN;
      let icLroll: FrontViewIc | null = null;
      const fitY = this.fitY;
      let block = 0;
      let filled = 0;
      for (let k = 1; k < lp.length; k++) {
        const p = lp[k]!;
        this.warm(sl, this.nomL, k, k - 1);
        sl.solve(p.travelMm, p.rackMm);
        poses++;
        if (p.kind === P_ZERO) zeroToe[p.tag] = toeOf(sl);
        else if (p.kind === P_BUMP) {
          bumpToe[p.tag] = toeOf(sl);
          if (p.tag === 0) bumpCpY = poseRow(sl).contactPatch[1];
        } else if (p.kind === P_GRID) {
          if (p.tag !== block) {
            block = p.tag;
            filled = 0;
          }
          fitY[p.grid] = toeOf(sl);
          if (++filled === fitY.length) {
            const [, a1] = polyFit(this.fitX, fitY, false);
            grads[p.tag] = a1;
            if (p.tag === 0) {
              const [, , q2] = polyFit(this.fitX, fitY, true);
              out[idx['bumpSteerCurvatureDegPerM2']!] = 2 * q2;
            }
          }
        } else if (p.kind === P_ROLL) {
          // Steer angle, positive to the left: the left side's is minus its toe.
          if (p.tag > 0) {
            steerRollL = -toeOf(sl);
            icLroll = frontViewIc(sl);
          } else steerRollLm = -toeOf(sl);
        }
      }
      // Right side roll poses.
      const rp = this.rightPoses;
      let steerRollR = NaN;
      let steerRollRm = NaN;
      let rcRoll: ReturnType<typeof rollCentreOf> = null;
      for (let k = 1; k < rp.length; k++) {
        const p = rp[k]!;
        this.warm(sr, this.nomR, k, k - 1);
        sr.solve(p.travelMm, p.rackMm);
        poses++;
        // Right side steer angle = its toe (toe_R = δ_R).
        if (p.tag > 0) {
          steerRollR = toeOf(sr);
          rcRoll = icLroll ? rollCentreOf(icLroll, frontViewIc(sr)) : null;
        } else steerRollRm = toeOf(sr);
      }
      const phi = this.spec.analysis.rollDeg;
      out[idx['rollSteerSecantDegPerDeg']!] = -((steerRollL + steerRollR) / 2 - (steerRollLm + steerRollRm) / 2) / (2 * phi);
      out[idx['rollCentreHeightAtRollMm']!] = rcRoll ? rcRoll.heightMm : NaN;

      out[idx['bumpSteerDegPerM']!] = grads[0]!;
      let spread = 0;
      let cost = 0;
      for (let r = 0; r < racks.length; r++) {
        if (r > 0) {
          out[idx[`bumpSteerDegPerM@${racks[r]}`]!] = grads[r]!;
          spread = Math.max(spread, Math.abs(grads[r]! - grads[0]!));
        }
        cost = Math.max(cost, Math.abs(bumpToe[r]! - zeroToe[r]!));
      }
      if (racks.length > 1) out[idx['lockBumpSteerSpreadDegPerM']!] = spread;
      out[idx['bumpToeChangeDeg']!] = cost;
      out[idx['bumpScrubMm']!] = Math.abs(bumpCpY - rowL.contactPatch[1]);

      if (this.linked && this.nominalK !== null) {
        const k = this.understeerGradient(out, rowL, rowR);
        out[idx['understeerGradientChangeDegPerG']!] = k - this.nominalK;
        if (this.spec.kind === 'sweep') out[idx['balanceGainDegPerG']!] = (this.spec.balanceDirection === 'more-understeer' ? 1 : -1) * (k - this.nominalK);
      }
      return { values: out, poses, error: null };
    } catch (e) {
      if (e instanceof SolveError || e instanceof InputError) {
        out.fill(NaN);
        return { values: out, poses, error: e.message };
      }
      throw e;
    }
  }

  /** Understeer gradient (deg/g) of the linked vehicle with this sample's axle values (balance model, shared/balance). */
  private understeerGradient(out: Float64Array, rowL: PoseRow, rowR: PoseRow): number {
    const lv = this.linked!;
    const name = this.spec.axle;
    const link = lv[name];
    const axle = structuredClone(lv.vehicle[name]);
    const idx = this.index;
    const rc = out[idx['rollCentreHeightMm']!]!;
    if (link.source.rollSteerCoefficient === 'kinematics') axle.rollSteerCoefficient = out[idx['rollSteerCoefficient']!]!;
    if (link.source.rollCamberDegPerDeg === 'kinematics') axle.rollCamberDegPerDeg = out[idx['rollCamberDegPerDeg']!]!;
    if (link.source.rollCentreHeightMm === 'kinematics' && Number.isFinite(rc)) axle.rollCentreHeightMm = rc;
    if (link.source.springMotionRatio === 'kinematics' && axle.spring && rowL.motionRatio !== undefined && rowR.motionRatio !== undefined) axle.spring.motionRatio = (rowL.motionRatio + rowR.motionRatio) / 2;
    const b = axle.antiRollBar;
    if (link.source.barMotionRatio === 'kinematics' && b && 'linkMotionRatio' in b && rowL.barMotionRatio !== undefined && rowR.barMotionRatio !== undefined) b.linkMotionRatio = (rowL.barMotionRatio + rowR.barMotionRatio) / 2;
    return understeerBudget(balanceCore({ ...lv.vehicle, [name]: axle })).understeerBudget.total;
  }

  /** Moves of one tolerance entry's draw on a corner. */
  static applyTolerance(pts: Record<string, Vec3>, moves: PointMoves, t: Tolerance, d: [number, number, number]): void {
    const p = moves[t.point] ?? pts[t.point]!;
    moves[t.point] = [p[0] + d[0], p[1] + d[1], p[2] + d[2]];
  }

  static axisIndex(a: 'x' | 'y' | 'z'): 0 | 1 | 2 {
    return AXIS_INDEX[a];
  }
}
