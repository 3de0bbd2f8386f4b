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
import {
  compileCorner,
  moveCornerPoints,
  CornerSolver,
  poseRow,
  wheelStateInto,
  WHEEL_TOE,
  WHEEL_CAMBER,
  WHEEL_TOE_GRADIENT,
  WHEEL_CAMBER_GRADIENT,
  WHEEL_CP,
  polyFit,
  frontViewIcInto,
  rollCentreHeightOf,
  checkRack,
  type CornerModel,
  type PoseRow,
} from '../kinematics/index.js';
import { linkVehicle, type LinkedVehicle } from '../balance/link.js';
import { balanceCore, understeerBudget } from '../balance/understeer.js';
import { resolveTrackProfile, type TrackProfile } from '../tracks/profiles.js';
import { thresholdsFor, CAUTION_RULES, type CautionThresholds, type LevelThresholds } from '../cautions/cautions.js';
import { RandomRoadYawCost } from '../ride/cost.js';
import { GH_NODES, GH_WEIGHTS } from '../ride/toe.js';
import { ROAD_CLASS_WORDS } from '../ride/road.js';
import { FIXED_POINTS, type StudySpec } from './schema.js';
import { DEG_PER_RAD } from '../angles.js';
import { pointName } from '../io/hardpoint-points.js';

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
const P_RIDE_ZERO = 5; // travel 0 at the operating-steer rack of the ride model's bump cost
const P_RIDE = 6; // a Gauss–Hermite travel of the ride model's bump cost at a judged rack

/** Gauss–Hermite nodes outward from design: up, then down (node 4 is travel 0). */
const RIDE_NODE_ORDER = [5, 6, 7, 8, 3, 2, 1, 0];

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

/**
 * A factor in words: the point's name as the hardpoint table writes it (shared/io/hardpoint-points.ts),
 * the coordinate, and the side of a tolerance study ("Upper ball joint, z (left)").
 */
export function factorLabel(corner: Corner, point: string, axis: 'x' | 'y' | 'z', side: 'left' | 'right' | 'both'): string {
  return `${pointName(`points.${point}`, corner)}, ${axis}${side === 'both' ? '' : ` (${side})`}`;
}

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
  return -Math.atan2(-ax, ay) * DEG_PER_RAD;
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
  readonly setupSens: { camberPerShim: number; toePerShim: number; toePerLength: number; camberPerLength: number } | null;
  /** Points a camber shim moves along y: the upper-arm pickups (double wishbone) or the strut top (camber plate). */
  private readonly shimPoints: string[];
  private readonly buildL: BuildSide;
  private readonly buildR: BuildSide;
  /** Balance-model sensitivities ∂K/∂(ε, roll camber, roll-centre height) and the nominal values they start from. */
  private readonly balanceSens: [number, number, number] | null = null;
  private readonly nominalAxle: [number, number, number] = [0, 0, 0];
  private readonly D = new Float64Array(9);
  /** Per-rack scratch of a sample: toe at design and over the bump, bump-steer gradient. */
  private readonly zeroToe = new Float64Array(8);
  private readonly bumpToe = new Float64Array(8);
  private readonly grads = new Float64Array(8);
  private readonly fitX: Float64Array;
  private readonly fitY: Float64Array;
  /** Output index by key. */
  readonly index: Record<string, number> = {};
  /** The ride model's random-road bump cost (shared/ride) on the profile's ISO 8608 road; null without a vehicle with ride data. */
  readonly ride: RandomRoadYawCost | null = null;
  /** Why there is no ride-model bump cost (null when there is one). */
  readonly rideWhy: string | null = null;
  /** Racks judged by the ride model: 0 and, steered, the operating steer of the profile's corner. */
  readonly rideRacks: number[] = [];
  /** Gauss–Hermite toe per judged rack (9 nodes each), left and right, and the toe at design height. */
  private readonly rideToeL = new Float64Array(18);
  private readonly rideToeR = new Float64Array(18);
  /** Per judged rack: the left and right toe RMS handed to the ride model. */
  private readonly rideRms: [number, number][] = [];
  /** Output index of each rack's bump-steer gradient (rack 0: the main one). */
  private readonly gradIndex: number[] = [];
  /** Scratch of a sample: the wheel state of a pose and of each side's design pose, and front-view instant centres (static left and right, left and right at roll). */
  private readonly wheel = new Float64Array(10);
  private readonly wheelL = new Float64Array(10);
  private readonly wheelR = new Float64Array(10);
  private readonly icL = new Float64Array(6);
  private readonly icR = new Float64Array(6);
  private readonly icLroll = new Float64Array(6);
  private readonly icRroll = new Float64Array(6);
  /** Poses solved for the sample being evaluated. */
  private poses = 0;

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
    if (spec.vehicle) {
      try {
        this.ride = new RandomRoadYawCost(spec.vehicle, spec.axle, this.profile);
        this.rideRacks = this.ride.racksMm(this.corner);
        checkRack(this.model, this.rideRacks, 'trackProfile');
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        this.ride = null;
        this.rideRacks = [];
        this.rideWhy = e.issues[0] ? `${e.issues[0].path}: ${e.issues[0].message}` : e.message;
      }
    } else this.rideWhy = 'give the vehicle (with its ride data) to price the bump steer on the profile’s road';
    this.outputs = this.buildOutputs(spec);
    this.outputs.forEach((o, i) => (this.index[o.key] = i));
    this.gradIndex = this.racks.map((r, k) => this.index[k === 0 ? 'bumpSteerDegPerM' : `bumpSteerDegPerM@${r}`]!);
    this.rideRms = this.rideRacks.map(() => [0, 0]);

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
    const s = this.halfTrackMm * Math.sin(a.rollDeg / DEG_PER_RAD);
    // Roll φ > 0 (right side down): left travel −s, right +s (domain.md).
    left.push({ kind: P_ROLL, travelMm: -s, rackMm: 0, tag: 1, grid: 0 }, { kind: P_ROLL, travelMm: s, rackMm: 0, tag: -1, grid: 0 });
    const right: PoseDef[] = [
      { kind: P_STATIC, travelMm: 0, rackMm: 0, tag: 0, grid: 0 },
      { kind: P_ROLL, travelMm: s, rackMm: 0, tag: 1, grid: 0 },
      { kind: P_ROLL, travelMm: -s, rackMm: 0, tag: -1, grid: 0 },
    ];
    // The ride model's toe statistics (shared/ride ToeCurve.gaussian): both wheels at the Gauss–Hermite travels
    // σ·xᵢ (clipped to the profile's travel range) at each judged rack; travel 0 at rack 0 is the design pose.
    if (this.ride) {
      const [lo, hi] = this.profile.travelMm;
      const sigma = this.ride.sigmaMm;
      for (const poses of [left, right]) {
        this.rideRacks.forEach((rack, c) => {
          if (rack !== 0) poses.push({ kind: P_RIDE_ZERO, travelMm: 0, rackMm: rack, tag: c, grid: 4 });
          for (const g of RIDE_NODE_ORDER) poses.push({ kind: P_RIDE, travelMm: Math.min(hi, Math.max(lo, GH_NODES[g]! * sigma)), rackMm: rack, tag: c, grid: g });
        });
      }
    }
    this.leftPoses = left;
    this.rightPoses = right;
    this.fitX = new Float64Array(n);
    for (let i = 0; i < n; i++) this.fitX[i] = this.travels[i]! / 1000;
    this.fitY = new Float64Array(n);

    this.shimPoints = this.corner.type === 'double-wishbone' ? ['upperFront', 'upperRear'] : this.corner.type === 'strut' ? ['strutTop'] : [];
    this.buildL = new BuildSide(this.model, 'left', this.shimPoints);
    this.buildR = new BuildSide(this.model, 'right', this.shimPoints);
    this.nomL = this.solveNominal(left, 'left');
    this.nomR = this.solveNominal(right, 'right');
    const st = new CornerSolver(this.model, 'left');
    st.solve(0, 0);
    const row = poseRow(st);
    this.nominalStatic = { toeDeg: row.toeDeg, camberDeg: row.camberDeg };
    this.setupSens = spec.kind === 'tolerance' && (spec.setup.camberShimMm !== undefined || spec.setup.toeAdjusterStepMm !== undefined) ? this.setupSensitivities() : null;

    if (spec.vehicle) {
      const c = spec.axle === 'front' ? { frontCorner: this.corner, rearCorner: spec.otherCorner } : { frontCorner: spec.otherCorner, rearCorner: this.corner };
      this.linked = linkVehicle({ vehicle: spec.vehicle, ...c }, {}, null);
      this.nominalK = understeerBudget(balanceCore(this.linked.vehicle)).understeerBudget.total;
      const used = this.linked[spec.axle].used;
      this.nominalAxle = [used.rollSteerCoefficient, used.rollCamberDegPerDeg, used.rollCentreHeightMm];
      if (spec.kind === 'tolerance') this.balanceSens = this.balanceSensitivities();
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
      spec.factors.forEach((f, i) => out.push({ key: `${f.point}.${f.axis}`, label: factorLabel(this.corner, f.point, f.axis, 'both'), source: i, side: 'both', axis: f.axis }));
      return out;
    }
    const sides: ('left' | 'right')[] = spec.sides === 'both' ? ['left', 'right'] : ['left'];
    for (const side of sides) {
      spec.tolerances.forEach((t, i) => {
        const axes: ('x' | 'y' | 'z')[] = t.axis === 'sphere' ? ['x', 'y', 'z'] : [t.axis];
        for (const ax of axes) out.push({ key: `${side}.${t.point}.${ax}`, label: factorLabel(this.corner, t.point, ax, side), source: i, side, axis: ax });
      });
    }
    return out;
  }

  private buildOutputs(spec: StudySpec): OutputDefinition[] {
    const p = this.profile.id;
    const th: CautionThresholds = spec.cautionThresholds ?? {};
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
      { key: 'bumpToeChangeDeg', label: `Toe change over a ${this.profile.bumpHeightMm} mm single-wheel bump (${this.profile.label.toLowerCase()})`, unit: 'deg', breach: rule('bump-toe-change', true) },
      { key: 'bumpScrubMm', label: 'Contact-patch scrub over that bump', unit: 'mm', breach: rule('bump-lateral-scrub', true) },
    );
    if (this.ride) {
      const road = `${ROAD_CLASS_WORDS[this.profile.roadClass]} at ${this.profile.speedKph} km/h`;
      o.push(
        {
          key: 'bumpYawDisturbancePct',
          label: `Bump cost: RMS yaw-rate disturbance on an ${road}, % of the steady yaw rate on a ${this.profile.cornerRadiusM} m corner`,
          unit: '%',
          breach: rule('bump-yaw-disturbance', false),
        },
        { key: 'bumpYawRateRmsDegPerS', label: `RMS yaw-rate disturbance on an ${road}`, unit: 'deg/s' },
      );
    }
    if (spec.vehicle) o.push({ key: 'understeerGradientChangeDegPerG', label: 'Understeer-gradient change with the vehicle', unit: 'deg/g' });
    if (spec.kind === 'sweep') o.push({ key: 'balanceGainDegPerG', label: `Balance gained (${spec.balanceDirection === 'more-understeer' ? 'toward understeer' : 'toward oversteer'})`, unit: 'deg/g' });
    return o;
  }

  /**
   * The nominal poses, solved along the pose list as a sample will be: from
   * each pose, the solver's own predictor to the next, then Newton. Stores
   * per pose the converged state (c, R) and what the predictor missed
   * (Δc, and the rotation ΔR with R = ΔR·R_predicted): a sample adds the
   * nominal's miss to its own prediction, so only the difference between
   * the two predictors' errors is left for Newton.
   */
  private solveNominal(poses: PoseDef[], side: 'left' | 'right'): Float64Array {
    const s = new CornerSolver(this.model, side);
    const out = new Float64Array(24 * poses.length);
    const pc = new Float64Array(3);
    const pR = new Float64Array(9);
    s.solve(0, 0);
    poses.forEach((p, k) => {
      const o = 24 * k;
      if (k > 0) {
        s.predict(p.travelMm - s.travelMm, p.rackMm - s.rackMm);
        pc.set(s.c);
        pR.set(s.R);
        try {
          s.solve(p.travelMm, p.rackMm);
        } catch {
          // A long step the predictor could not bridge: walk there from design (the sample falls back to Newton alone).
          s.reset();
          s.solve(0, 0);
          s.solveTowards(p.travelMm, p.rackMm);
        }
        for (let i = 0; i < 3; i++) out[o + 12 + i] = s.c[i]! - pc[i]!;
        // ΔR = R · R_predictedᵀ
        for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out[o + 15 + 3 * i + j] = s.R[3 * i]! * pR[3 * j]! + s.R[3 * i + 1]! * pR[3 * j + 1]! + s.R[3 * i + 2]! * pR[3 * j + 2]!;
      }
      out.set(s.c, o);
      out.set(s.R, o + 3);
    });
    return out;
  }

  /** Predicts pose k of a sample from its previous pose: its own predictor, plus the nominal's miss at k. */
  private predictFrom(s: CornerSolver, nom: Float64Array, p: PoseDef, k: number): void {
    s.predict(p.travelMm - s.travelMm, p.rackMm - s.rackMm);
    const o = 24 * k;
    const c = s.c;
    const R = s.R;
    const D = this.D;
    for (let i = 0; i < 3; i++) c[i] = c[i]! + nom[o + 12 + i]!;
    for (let i = 0; i < 9; i++) D[i] = R[i]!;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) R[3 * i + j] = nom[o + 15 + 3 * i]! * D[j]! + nom[o + 15 + 3 * i + 1]! * D[3 + j]! + nom[o + 15 + 3 * i + 2]! * D[6 + j]!;
    }
  }

  /** Toe and camber per mm of camber shim and toe per mm of tie-rod length, at the nominal design (central differences). */
  private setupSensitivities() {
    const h = 0.05;
    const b = new BuildSide(this.model, 'left', this.shimPoints);
    const at = (shim: number, dl: number) => {
      b.apply(null, shim, dl);
      this.warm(b.solver, this.nomL, 0);
      b.solver.solve(0, 0);
      return { toe: toeOf(b.solver), camber: poseRow(b.solver).camberDeg };
    };
    const canShim = this.shimPoints.length > 0;
    const sp = canShim ? at(h, 0) : null;
    const sm = canShim ? at(-h, 0) : null;
    const lp = at(0, h);
    const lm = at(0, -h);
    return {
      camberPerShim: sp && sm ? (sp.camber - sm.camber) / (2 * h) : 0,
      toePerShim: sp && sm ? (sp.toe - sm.toe) / (2 * h) : 0,
      toePerLength: (lp.toe - lm.toe) / (2 * h),
      camberPerLength: (lp.camber - lm.camber) / (2 * h),
    };
  }

  /** Understeer gradient (deg/g) per unit of ε, roll camber and roll-centre height at the nominal design (central differences), for toleranced builds. */
  private balanceSensitivities(): [number, number, number] {
    const lv = this.linked!;
    const name = this.spec.axle;
    const link = lv[name];
    const k = (d: [number, number, number]) => {
      const axle = { ...lv.vehicle[name] };
      axle.rollSteerCoefficient = (axle.rollSteerCoefficient ?? 0) + d[0];
      axle.rollCamberDegPerDeg = (axle.rollCamberDegPerDeg ?? 0) + d[1];
      axle.rollCentreHeightMm += d[2];
      return understeerBudget(balanceCore({ ...lv.vehicle, [name]: axle })).understeerBudget.total;
    };
    const steps: [number, number, number] = [1e-3, 1e-3, 0.5];
    const used = [link.source.rollSteerCoefficient, link.source.rollCamberDegPerDeg, link.source.rollCentreHeightMm];
    return steps.map((h, i) => {
      if (used[i] !== 'kinematics') return 0;
      const d: [number, number, number] = [0, 0, 0];
      d[i] = h;
      const up = k(d);
      d[i] = -h;
      return (up - k(d)) / (2 * h);
    }) as [number, number, number];
  }

  /** Sets the solver to the nominal state of pose k. */
  private warm(s: CornerSolver, nom: Float64Array, k: number): void {
    const o = 24 * k;
    for (let i = 0; i < 3; i++) s.c[i] = nom[o + i]!;
    for (let i = 0; i < 9; i++) s.R[i] = nom[o + 3 + i]!;
    // As the nominal after reset: at design (so the next solve keeps no tangent history from an earlier sample).
    s.travelMm = 0;
    s.rackMm = 0;
    s.forgetHistory();
  }

  /**
   * One sample: a toleranced build (`offsets` of each side's points, left
   * frame, mm; `right` null keeps the right corner nominal) or a design
   * variant (`moves`: absolute positions, links made to fit, both sides).
   * Never throws for unsolvable geometry: the outcome carries the message.
   */
  evaluate(sample: { build: { left: PointMoves; right: PointMoves | null } } | { variant: PointMoves }, out: Float64Array): SampleOutcome {
    out.fill(NaN);
    this.poses = 0;
    const wheel = this.wheel;
    try {
      let sl: CornerSolver;
      let sr: CornerSolver;
      // A design variant's design-pose rows: the balance model takes its spring and bar motion from them.
      let rows: [PoseRow, PoseRow] | null = null;
      if ('build' in sample) {
        this.buildSide(this.buildL, sample.build.left, this.nomL);
        sl = this.buildL.solver;
        this.buildSide(this.buildR, sample.build.right, this.nomR);
        sr = this.buildR.solver;
      } else {
        const m = Object.keys(sample.variant).length ? compileCorner(moveCornerPoints(this.corner, { points: sample.variant })) : this.model;
        sl = new CornerSolver(m, 'left');
        sr = new CornerSolver(m, 'right');
        this.warm(sl, this.nomL, 0);
        sl.solve(0, 0);
        this.warm(sr, this.nomR, 0);
        sr.solve(0, 0);
        this.poses += 2;
        rows = [poseRow(sl), poseRow(sr)];
      }
      frontViewIcInto(sl, this.icL);
      frontViewIcInto(sr, this.icR);
      const idx = this.index;
      const wL = this.wheelL;
      const wR = this.wheelR;
      wheelStateInto(sl, wL);
      wheelStateInto(sr, wR);
      out[idx['staticToeDeg']!] = wL[WHEEL_TOE]!;
      out[idx['staticCamberDeg']!] = wL[WHEEL_CAMBER]!;
      const half = this.halfTrackMm;
      // ε = −dδ̄/dφ and roll camber at φ = 0 from the analytic gradients (as shared/kinematics rollSweep): ds/dφ = t/2 per rad, left −s, right +s.
      out[idx['rollSteerCoefficient']!] = -((wL[WHEEL_TOE_GRADIENT]! + wR[WHEEL_TOE_GRADIENT]!) / 2000) * half / DEG_PER_RAD;
      out[idx['rollCamberDegPerDeg']!] = 1 + ((wL[WHEEL_CAMBER_GRADIENT]! + wR[WHEEL_CAMBER_GRADIENT]!) / 2000) * half / DEG_PER_RAD;
      out[idx['rollCentreHeightMm']!] = rollCentreHeightOf(this.icL, this.icR);

      // Left pose list (from index 1: the static pose is solved).
      const lp = this.leftPoses;
      const racks = this.racks;
      const zeroToe = this.zeroToe;
      const bumpToe = this.bumpToe;
      const grads = this.grads;
      let bumpCpY = NaN;
      let steerRollL = NaN;
      let steerRollLm = NaN;
      let rollIcL = false;
      const fitY = this.fitY;
      let block = 0;
      let filled = 0;
      for (let k = 1; k < lp.length; k++) {
        const p = lp[k]!;
        this.predictFrom(sl, this.nomL, p, k);
        sl.solve(p.travelMm, p.rackMm);
        this.poses++;
        if (p.kind === P_ZERO) zeroToe[p.tag] = toeOf(sl);
        else if (p.kind === P_BUMP) {
          bumpToe[p.tag] = toeOf(sl);
          if (p.tag === 0) {
            wheelStateInto(sl, wheel);
            bumpCpY = wheel[WHEEL_CP + 1]!;
          }
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
            frontViewIcInto(sl, this.icLroll);
            rollIcL = true;
          } else steerRollLm = -toeOf(sl);
        } else this.rideToeL[9 * p.tag + p.grid] = toeOf(sl);
      }
      if (this.ride) this.rideToeL[4] = zeroToe[0]!;
      // Right side roll poses.
      const rp = this.rightPoses;
      let steerRollR = NaN;
      let steerRollRm = NaN;
      let rcRoll = NaN;
      for (let k = 1; k < rp.length; k++) {
        const p = rp[k]!;
        this.predictFrom(sr, this.nomR, p, k);
        sr.solve(p.travelMm, p.rackMm);
        this.poses++;
        if (p.kind === P_RIDE || p.kind === P_RIDE_ZERO) {
          this.rideToeR[9 * p.tag + p.grid] = toeOf(sr);
          continue;
        }
        // Right side steer angle = its toe (toe_R = δ_R).
        if (p.tag > 0) {
          steerRollR = toeOf(sr);
          if (rollIcL) {
            frontViewIcInto(sr, this.icRroll);
            rcRoll = rollCentreHeightOf(this.icLroll, this.icRroll);
          }
        } else steerRollRm = toeOf(sr);
      }
      const phi = this.spec.analysis.rollDeg;
      out[idx['rollSteerSecantDegPerDeg']!] = -((steerRollL + steerRollR) / 2 - (steerRollLm + steerRollRm) / 2) / (2 * phi);
      out[idx['rollCentreHeightAtRollMm']!] = rcRoll;

      let spread = 0;
      let cost = 0;
      for (let r = 0; r < racks.length; r++) {
        out[this.gradIndex[r]!] = grads[r]!;
        if (r > 0) {
          spread = Math.max(spread, Math.abs(grads[r]! - grads[0]!));
        }
        cost = Math.max(cost, Math.abs(bumpToe[r]! - zeroToe[r]!));
      }
      if (racks.length > 1) out[idx['lockBumpSteerSpreadDegPerM']!] = spread;
      out[idx['bumpToeChangeDeg']!] = cost;
      out[idx['bumpScrubMm']!] = Math.abs(bumpCpY - wL[WHEEL_CP + 1]!);
      if (this.ride) {
        this.rideToeR[4] = wR[WHEEL_TOE]!;
        const rms = this.rideRms;
        for (let c = 0; c < rms.length; c++) {
          rms[c]![0] = gaussRms(this.rideToeL, c);
          rms[c]![1] = gaussRms(this.rideToeR, c);
        }
        const y = this.ride.fromToeRms(rms);
        if (y) {
          out[idx['bumpYawDisturbancePct']!] = y.yawDisturbancePct;
          out[idx['bumpYawRateRmsDegPerS']!] = y.yawRateRmsDegPerS;
        }
      }

      if (this.linked && this.nominalK !== null) {
        let dk: number;
        if (rows) dk = this.understeerGradient(out, rows[0], rows[1]) - this.nominalK;
        else {
          const g = this.balanceSens!;
          const rc = out[idx['rollCentreHeightMm']!]!;
          dk = g[0] * (out[idx['rollSteerCoefficient']!]! - this.nominalAxle[0]) + g[1] * (out[idx['rollCamberDegPerDeg']!]! - this.nominalAxle[1]) + (Number.isFinite(rc) ? g[2] * (rc - this.nominalAxle[2]) : 0);
        }
        out[idx['understeerGradientChangeDegPerG']!] = dk;
        if (this.spec.kind === 'sweep') out[idx['balanceGainDegPerG']!] = (this.spec.balanceDirection === 'more-understeer' ? 1 : -1) * dk;
      }
      return { values: out, poses: this.poses, error: null };
    } catch (e) {
      if (e instanceof SolveError || e instanceof InputError) {
        out.fill(NaN);
        return { values: out, poses: this.poses, error: e.message };
      }
      throw e;
    }
  }

  /**
   * Assembles one side of a toleranced build at design height and, with a
   * set-up given, sets it as on an alignment stand.
   */
  private buildSide(bs: BuildSide, offsets: PointMoves | null, nom: Float64Array): void {
    const setup = this.spec.kind === 'tolerance' ? this.spec.setup : null;
    const s = bs.solver;
    bs.apply(offsets, 0, 0);
    this.warm(s, nom, 0);
    s.solve(0, 0);
    this.poses++;
    if (setup && this.setupSens && (setup.camberShimMm !== undefined || setup.toeAdjusterStepMm !== undefined)) {
      // As on an alignment stand: read toe and camber, set the shim and the tie-rod length that cancel both
      // (their coupling through the nominal sensitivities), to the shim and adjuster resolution; read and set again.
      const g = this.setupSens;
      const useShim = setup.camberShimMm !== undefined && g.camberPerShim !== 0;
      const useToe = setup.toeAdjusterStepMm !== undefined && g.toePerLength !== 0;
      let shim = 0;
      let dl = 0;
      for (let pass = 0; pass < 2; pass++) {
        wheelStateInto(s, this.wheel);
        const dc = -(this.wheel[WHEEL_CAMBER]! - this.nominalStatic.camberDeg);
        const dt = -(toeOf(s) - this.nominalStatic.toeDeg);
        let a = 0;
        let b = 0;
        if (useShim && useToe) {
          const det = g.camberPerShim * g.toePerLength - g.camberPerLength * g.toePerShim;
          a = (dc * g.toePerLength - g.camberPerLength * dt) / det;
          b = (g.camberPerShim * dt - g.toePerShim * dc) / det;
        } else if (useShim) a = dc / g.camberPerShim;
        else b = dt / g.toePerLength;
        const nextShim = useShim ? quantize(shim + a, setup.camberShimMm) : 0;
        const nextDl = useToe ? quantize(dl + b, setup.toeAdjusterStepMm) : 0;
        if (nextShim === shim && nextDl === dl) break;
        shim = nextShim;
        dl = nextDl;
        bs.apply(offsets, shim, dl);
        s.solve(0, 0);
        this.poses++;
      }
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
    // The link wrote the corner's bar twist per wheel travel into the evaluated bar (shared/balance/link.ts): this build's own twist replaces it.
    if (link.source.barTwistRadPerM === 'kinematics' && b && 'outerDiameterMm' in b && rowL.barTwistRadPerM !== undefined && rowR.barTwistRadPerM !== undefined) b.twistRadPerM = (rowL.barTwistRadPerM + rowR.barTwistRadPerM) / 2;
    return understeerBudget(balanceCore({ ...lv.vehicle, [name]: axle })).understeerBudget.total;
  }

  static axisIndex(a: 'x' | 'y' | 'z'): 0 | 1 | 2 {
    return AXIS_INDEX[a];
  }
}

/**
 * One side of a toleranced build: a working copy of the nominal model whose
 * link points, kingpin points and strut mounts are moved in place for each
 * sample (links keep their drawing lengths; the tie rod's changes only by
 * the toe adjuster), with one solver that is reused. Spring, rocker and bar
 * linkages stay at their nominal geometry.
 */
class BuildSide {
  readonly model: CornerModel;
  readonly solver: CornerSolver;
  private readonly inner: Record<string, number[]> = {};
  private readonly outer: Record<string, number[]> = {};

  constructor(
    private readonly nominal: CornerModel,
    side: 'left' | 'right',
    private readonly shimPoints: string[],
  ) {
    const n = nominal;
    const v3 = (v: Vec3): Vec3 => [v[0], v[1], v[2]];
    const kp = n.kingpin;
    this.model = {
      ...n,
      bodyPts: n.bodyPts.slice(),
      localPts: n.localPts.slice(),
      lengths: n.lengths.slice(),
      strut: n.strut && { ...n.strut, top: n.strut.top.slice(), lowerLocal: n.strut.lowerLocal.slice() },
      kingpin: kp.kind === 'points' ? { kind: 'points', lowerLocal: v3(kp.lowerLocal), upperLocal: v3(kp.upperLocal) } : kp.kind === 'strut' ? { kind: 'strut', lowerLocal: v3(kp.lowerLocal), top: v3(kp.top) } : kp,
      lowerOuterLocal: n.lowerOuterLocal && v3(n.lowerOuterLocal),
      upperOuterLocal: n.upperOuterLocal && v3(n.upperOuterLocal),
    };
    // Which constraint rows each point ends: matched by position in the nominal corner.
    const pts = n.corner.points as Record<string, Vec3>;
    const same = (a: ArrayLike<number>, o: number, p: Vec3, shift: Vec3 | null) =>
      Math.abs(a[o]! + (shift ? shift[0] : 0) - p[0]) < 1e-9 && Math.abs(a[o + 1]! + (shift ? shift[1] : 0) - p[1]) < 1e-9 && Math.abs(a[o + 2]! + (shift ? shift[2] : 0) - p[2]) < 1e-9;
    for (const [name, p] of Object.entries(pts)) {
      for (let i = 0; i < n.nDist; i++) {
        if (same(n.bodyPts, 3 * i, p, null)) (this.inner[name] ??= []).push(i);
        if (same(n.localPts, 3 * i, p, n.wc0)) (this.outer[name] ??= []).push(i);
      }
    }
    this.solver = new CornerSolver(this.model, side);
  }

  /** Back to nominal, then the sample's offsets (left frame, mm), a camber shim along y and a tie-rod length change (mm). */
  apply(offsets: PointMoves | null, shimMm: number, tieRodMm: number): void {
    const n = this.nominal;
    const m = this.model;
    m.bodyPts.set(n.bodyPts);
    m.localPts.set(n.localPts);
    m.lengths.set(n.lengths);
    const kp = m.kingpin;
    const nkp = n.kingpin;
    if (m.strut && n.strut) {
      m.strut.top.set(n.strut.top);
      m.strut.lowerLocal.set(n.strut.lowerLocal);
    }
    if (kp.kind === 'points' && nkp.kind === 'points') {
      copy3(kp.lowerLocal, nkp.lowerLocal);
      copy3(kp.upperLocal, nkp.upperLocal);
    } else if (kp.kind === 'strut' && nkp.kind === 'strut') {
      copy3(kp.lowerLocal, nkp.lowerLocal);
      copy3(kp.top, nkp.top);
    }
    if (m.lowerOuterLocal && n.lowerOuterLocal) copy3(m.lowerOuterLocal, n.lowerOuterLocal);
    if (m.upperOuterLocal && n.upperOuterLocal) copy3(m.upperOuterLocal, n.upperOuterLocal);
    if (offsets) for (const name in offsets) this.move(name, offsets[name]!);
    if (shimMm !== 0) for (const name of this.shimPoints) this.move(name, [0, shimMm, 0]);
    m.lengths[m.steerRow]! += tieRodMm;
    this.solver.modelMoved();
  }

  private move(name: string, d: Vec3): void {
    const m = this.model;
    for (const i of this.inner[name] ?? []) add3(m.bodyPts, 3 * i, d);
    for (const i of this.outer[name] ?? []) add3(m.localPts, 3 * i, d);
    const kp = m.kingpin;
    if (name === 'strutTop' && m.strut) {
      add3(m.strut.top, 0, d);
      if (kp.kind === 'strut') add3(kp.top, 0, d);
    } else if (name === 'strutLower' && m.strut) add3(m.strut.lowerLocal, 0, d);
    else if (name === 'lowerOuter') {
      if (kp.kind !== 'instant') add3(kp.lowerLocal, 0, d);
      if (m.lowerOuterLocal) add3(m.lowerOuterLocal, 0, d);
    } else if (name === 'upperOuter') {
      if (kp.kind === 'points') add3(kp.upperLocal, 0, d);
      if (m.upperOuterLocal) add3(m.upperOuterLocal, 0, d);
    }
  }
}

/** v rounded to the nearest multiple of step (no step: v). */
function quantize(v: number, step: number | undefined): number {
  return step ? Math.round(v / step) * step : v;
}

/** E[Δtoe²]^½ over the Gauss–Hermite travels of condition c (node 4: design height), as shared/ride ToeCurve.gaussian. */
function gaussRms(toe: Float64Array, c: number): number {
  const o = 9 * c;
  let m2 = 0;
  for (let i = 0; i < 9; i++) {
    const d = toe[o + i]! - toe[o + 4]!;
    m2 += GH_WEIGHTS[i]! * d * d;
  }
  return Math.sqrt(m2);
}

function copy3(a: number[] | Float64Array, b: ArrayLike<number>): void {
  a[0] = b[0]!;
  a[1] = b[1]!;
  a[2] = b[2]!;
}

function add3(a: number[] | Float64Array, o: number, d: ArrayLike<number>): void {
  a[o] = a[o]! + d[0]!;
  a[o + 1] = a[o + 1]! + d[1]!;
  a[o + 2] = a[o + 2]! + d[2]!;
}
