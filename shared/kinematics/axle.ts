/**
 * Axle kinematics from a left corner and its mirror (or an explicit right
 * corner): front- and side-view instant centres, roll centre, anti-dive /
 * anti-squat, steering (ratio, Ackermann), and the roll sweep of domain.md
 * (roll steer coefficient ε = −dδ̄/dφ, roll camber). Every derivative comes
 * from the solver's analytic pose tangents.
 */
import { InputError, SolveError, formatPath } from '../errors.js';
import { cornerSchema, type Corner, type Vec3 } from '../schema/corner.js';
import { compileCorner } from './model.js';
import { CornerSolver } from './solver.js';
import { kingpinAxis, poseOutputs, uprightPoint, wheelStateInto, WHEEL_CP, type PoseResult } from './pose.js';
import { expandRange, checkRack, type Range } from './sweep.js';
import { DEG_PER_RAD } from '../angles.js';
import type { AxleName } from '../schema/axle.js';

// ---------- the two sides ----------

/** Mirrors a RIGHT corner (vehicle frame, y < 0) into the left frame; the rack axis stays a vehicle-frame direction. */
/** A point as a document holds it: three numbers. */
function isPoint(v: unknown): v is [number, number, number] {
  return Array.isArray(v) && v.length === 3 && v.every((n) => typeof n === 'number');
}

export function rightCornerToLeftFrame(right: unknown): Corner {
  const flip = (v: unknown, key: string): unknown => {
    if (isPoint(v) && key !== 'rackAxis') return [v[0], -v[1], v[2]];
    if (Array.isArray(v)) return v.map((x) => flip(x, ''));
    if (v && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, flip(x, k)]));
    return v;
  };
  const r = cornerSchema.safeParse(flip(right, ''));
  if (!r.success) {
    const issues = r.error.issues.map((i) => ({ path: `rightCorner.${formatPath(i.path)}`, message: i.message.replace(/\(y (-?[\d.]+)/g, '(mirrored y $1') }));
    throw new InputError(`Invalid right corner (checked as its mirror image): ${issues[0]!.path}: ${issues[0]!.message}`, issues);
  }
  return r.data;
}

/** Left and right solvers of an axle (right = mirror of the left corner unless given). */
export interface AxleSides {
  left: CornerSolver;
  right: CornerSolver;
  /** Design contact-patch track, mm. */
  trackMm: number;
}

export function axleSides(corner: Corner, rightCorner?: unknown): AxleSides {
  const lm = compileCorner(corner);
  const rm = rightCorner === undefined ? lm : compileCorner(rightCornerToLeftFrame(rightCorner));
  if (rm.corner.steered !== lm.corner.steered) {
    throw new InputError('rightCorner.steered must match the left corner', [{ path: 'rightCorner.steered', message: 'must match the left corner' }]);
  }
  return { left: new CornerSolver(lm, 'left'), right: new CornerSolver(rm, 'right'), trackMm: lm.cp0[1] + rm.cp0[1] };
}

/** Steering input range both sides accept. */
function axleStroke(sides: AxleSides): [number, number] {
  const a = sides.left.model.rackStroke;
  const b = sides.right.model.rackStroke;
  return [Math.max(a[0], b[0]), Math.min(a[1], b[1])];
}

function checkAxleRack(sides: AxleSides, racks: number[], field: string): void {
  checkRack(sides.left.model, racks, field);
  if (sides.right.model !== sides.left.model) checkRack(sides.right.model, racks, field);
}

/** Steer angle rate of a solved side, deg per mm of travel (from the toe gradient: toe_L = −δ_L, toe_R = δ_R). */
function steerRatePerMm(p: PoseResult): number {
  return ((p.side === 'left' ? -1 : 1) * p.toeGradientDegPerM) / 1000;
}

/** Steer angle rate per mm of rack at the current pose, deg/mm (from the steering tangent). */
function steerPerRack(s: CornerSolver): number {
  const m = s.model;
  const a = rot(s.R, m.spin0);
  const w: Vec3 = [s.tSteer[3]!, s.tSteer[4]!, s.tSteer[5]!];
  const da: Vec3 = [w[1] * a[2] - w[2] * a[1], w[2] * a[0] - w[0] * a[2], w[0] * a[1] - w[1] * a[0]];
  const ddm = (a[0] * da[1] - a[1] * da[0]) / (a[0] * a[0] + a[1] * a[1]);
  return (s.side === 'left' ? ddm : -ddm) * DEG_PER_RAD;
}

function rot(R: Float64Array, v: ArrayLike<number>): Vec3 {
  return [R[0]! * v[0]! + R[1]! * v[1]! + R[2]! * v[2]!, R[3]! * v[0]! + R[4]! * v[1]! + R[5]! * v[2]!, R[6]! * v[0]! + R[7]! * v[1]! + R[8]! * v[2]!];
}

// ---------- instant centres ----------

/** Design position (left frame) of the upright point now at p: wc0 + Rᵀ(p − c). */
function designPosition(s: CornerSolver, p: Vec3): Vec3 {
  const R = s.R;
  const d = [p[0] - s.c[0]!, p[1] - s.c[1]!, p[2] - s.c[2]!] as const;
  const w = s.model.wc0;
  return [
    w[0] + R[0]! * d[0] + R[3]! * d[1] + R[6]! * d[2],
    w[1] + R[1]! * d[0] + R[4]! * d[1] + R[7]! * d[2],
    w[2] + R[2]! * d[0] + R[5]! * d[1] + R[8]! * d[2],
  ];
}

export interface FrontViewIc {
  /** Instant centre in the vehicle front view (y, z), mm; null at infinity (parallel arms). */
  yMm: number | null;
  zMm: number | null;
  /** Unit direction (y, z) of the line from the contact patch toward the instant centre. */
  lineDir: [number, number];
  /** Contact patch (y, z) the line passes through, mm. */
  cp: [number, number];
}

/** Slots of frontViewIcInto's output. */
const IC_Y = 0;
const IC_Z = 1;
const IC_DIR_Y = 2;
const IC_DIR_Z = 3;
const IC_CP_Y = 4;
const IC_CP_Z = 5;

const wheel = new Float64Array(10);

/**
 * The front-view instant centre of a solved side, in the vehicle frame
 * (right side mirrored back), written to out: [y, z] (NaN at infinity),
 * the unit direction (y, z) from the contact patch toward it, and the
 * contact patch (y, z). No allocation: studies call it per sample.
 */
export function frontViewIcInto(s: CornerSolver, out: Float64Array): void {
  wheelStateInto(s, wheel);
  const sg = s.side === 'left' ? 1 : -1;
  const R = s.R;
  const c = s.c;
  const t = s.tTravel;
  // Velocity of the upright point that is the contact patch at this pose (left frame): v = v_c + ω × (p − c),
  // with p − c taken through the point's design position, R·(Rᵀ(p − c)), in the order uprightPoint rounds it,
  // so the figures are the same to the last bit as before this scalar form.
  const w = s.model.wc0;
  const e0 = wheel[WHEEL_CP]! - c[0]!;
  const e1 = wheel[WHEEL_CP + 1]! - c[1]!;
  const e2 = wheel[WHEEL_CP + 2]! - c[2]!;
  const q0 = w[0] + R[0]! * e0 + R[3]! * e1 + R[6]! * e2 - w[0];
  const q1 = w[1] + R[1]! * e0 + R[4]! * e1 + R[7]! * e2 - w[1];
  const q2 = w[2] + R[2]! * e0 + R[5]! * e1 + R[8]! * e2 - w[2];
  const d0 = R[0]! * q0 + R[1]! * q1 + R[2]! * q2;
  const d1 = R[3]! * q0 + R[4]! * q1 + R[5]! * q2;
  const d2 = R[6]! * q0 + R[7]! * q1 + R[8]! * q2;
  const wx = t[3]!;
  const wy = t[4]!;
  const wz = t[5]!;
  const vy = t[1]! + (wz * d0 - wx * d2);
  const vz = t[2]! + (wx * d1 - wy * d0);
  // Left frame: the instant centre lies on the perpendicular to the contact-patch velocity.
  let dy = -vz;
  let dz = vy;
  const n = Math.hypot(dy, dz);
  dy /= n;
  dz /= n;
  if (dy > 0) {
    // Point the line inboard (toward −y in the left frame).
    dy = -dy;
    dz = -dz;
  }
  const cpy = wheel[WHEEL_CP + 1]!;
  const cpz = wheel[WHEEL_CP + 2]!;
  const far = Math.abs(wx) < 1e-12;
  out[IC_Y] = far ? NaN : sg * (cpy - vz / wx);
  out[IC_Z] = far ? NaN : cpz + vy / wx;
  out[IC_DIR_Y] = sg * dy;
  out[IC_DIR_Z] = dz;
  out[IC_CP_Y] = sg * cpy;
  out[IC_CP_Z] = cpz;
}

const ic = new Float64Array(6);

/** Front-view instant centre of a solved side, in the vehicle frame (right side mirrored back). */
export function frontViewIc(s: CornerSolver): FrontViewIc {
  frontViewIcInto(s, ic);
  const far = Number.isNaN(ic[IC_Y]!);
  return {
    yMm: far ? null : ic[IC_Y]!,
    zMm: far ? null : ic[IC_Z]!,
    lineDir: [ic[IC_DIR_Y]!, ic[IC_DIR_Z]!],
    cp: [ic[IC_CP_Y]!, ic[IC_CP_Z]!],
  };
}

/** Intersection of the two contact-patch-to-IC lines (front view), mm; null if parallel. */
export function rollCentreOf(l: FrontViewIc, r: FrontViewIc): { yMm: number; heightMm: number } | null {
  const a = alongLeftLine(l.cp[0], l.cp[1], l.lineDir[0], l.lineDir[1], r.cp[0], r.cp[1], r.lineDir[0], r.lineDir[1]);
  return Number.isNaN(a) ? null : { yMm: l.cp[0] + a * l.lineDir[0], heightMm: l.cp[1] + a * l.lineDir[1] };
}

/** Roll-centre height (mm) from two frontViewIcInto outputs, as rollCentreOf; NaN if the lines are parallel. */
export function rollCentreHeightOf(l: Float64Array, r: Float64Array): number {
  const a = alongLeftLine(l[IC_CP_Y]!, l[IC_CP_Z]!, l[IC_DIR_Y]!, l[IC_DIR_Z]!, r[IC_CP_Y]!, r[IC_CP_Z]!, r[IC_DIR_Y]!, r[IC_DIR_Z]!);
  return l[IC_CP_Z]! + a * l[IC_DIR_Z]!;
}

/** The a where the lines (ly, lz) + a·(ldy, ldz) and (ry, rz) + b·(rdy, rdz) cross; NaN if parallel. */
function alongLeftLine(ly: number, lz: number, ldy: number, ldz: number, ry: number, rz: number, rdy: number, rdz: number): number {
  const det = ldy * -rdz - ldz * -rdy;
  if (Math.abs(det) < 1e-12) return NaN;
  return ((ry - ly) * -rdz - (rz - lz) * -rdy) / det;
}

export interface SideViewIc {
  /** Side-view instant centre (x, z), mm; null at infinity. */
  xMm: number | null;
  zMm: number | null;
  /**
   * tan of the side-view swing-arm angle, v_x / v_z of the point in bump,
   * from the contact patch (outboard brakes) and from the wheel centre
   * (inboard drive): positive when the instant centre is behind and above
   * the point (a front axle's anti-dive sense); a rear axle uses −tan.
   */
  tanFromContactPatchFront: number;
  tanFromWheelCentreFront: number;
}

/** Side-view instant centre of the left corner at its current pose. */
export function sideViewIc(s: CornerSolver): SideViewIc {
  const p = poseOutputs(s);
  const cp = p.contactPatch;
  const sg = s.side === 'left' ? 1 : -1;
  const vcp = uprightPoint(s, designPosition(s, [cp[0], sg * cp[1], cp[2]]), s.tTravel).v;
  const vwc: Vec3 = [s.tTravel[0]!, s.tTravel[1]!, s.tTravel[2]!];
  const wy = s.tTravel[4]!;
  const far = Math.abs(wy) < 1e-12;
  return {
    xMm: far ? null : cp[0] + vcp[2] / wy,
    zMm: far ? null : cp[2] - vcp[0] / wy,
    // IC behind and above (a front axle's anti-dive side): the point moves forward in bump, tan = v_x / v_z.
    tanFromContactPatchFront: vcp[0] / vcp[2],
    tanFromWheelCentreFront: vwc[0] / vwc[2],
  };
}

// ---------- axle analysis ----------

export interface AntiOptions {
  /** Which axle the corner is. */
  axle: AxleName;
  cgHeightMm: number;
  wheelbaseMm: number;
  /** Share of braking force on the front axle (0–1); outboard brakes act at the contact patch. */
  brakeFrontFraction?: number | undefined;
  /** Share of drive force on the front axle (0–1); drive through half-shafts acts at the wheel centre. */
  driveFrontFraction?: number | undefined;
}

export interface AxleKinematicsOptions {
  rightCorner?: unknown | undefined;
  rackMm?: number | undefined;
  wheelbaseMm?: number | undefined;
  anti?: AntiOptions | undefined;
  /** Rack travel per handwheel revolution, mm (gives the overall steering ratio). */
  rackMmPerHandwheelRev?: number | undefined;
  /** Number of points over the rack stroke for the steering table (default 21). */
  steeringPoints?: number | undefined;
}

export interface SteeringRow {
  rackMm: number;
  leftSteerDeg: number;
  rightSteerDeg: number;
  axleSteerDeg: number;
  ackermannPercent: number | null;
}

/**
 * Ackermann percentage from the two wheels' steer angles MEASURED FROM THE
 * STRAIGHT-AHEAD POSE (static toe removed; see `straightAhead`), deg:
 * (δ_i − δ_o)/(δ_i,ideal − δ_o)·100, where the ideal inner angle for the
 * actual outer angle δ_o satisfies cot δ_o − cot δ_i,ideal = t_s/L, t_s the
 * distance between the two steering axes' ground points and L the wheelbase
 * (common practice; Gillespie, from memory). 100 % is the ideal, 0 % parallel
 * steer, negative anti-Ackermann. Null within 0.5° of straight ahead, where
 * the ratio is ill-conditioned.
 */
export function ackermannPercent(leftSteerDeg: number, rightSteerDeg: number, steeringAxisTrackMm: number | null, wheelbaseMm: number): number | null {
  const mean = (leftSteerDeg + rightSteerDeg) / 2;
  if (Math.abs(mean) < 0.5 || !(wheelbaseMm > 0) || steeringAxisTrackMm === null || !Number.isFinite(steeringAxisTrackMm)) return null;
  const left = mean > 0;
  const inner = Math.abs(left ? leftSteerDeg : rightSteerDeg) / DEG_PER_RAD;
  const outer = Math.abs(left ? rightSteerDeg : leftSteerDeg) / DEG_PER_RAD;
  if (!(outer > 0)) return null;
  const cotIdeal = 1 / Math.tan(outer) - steeringAxisTrackMm / wheelbaseMm;
  const ideal = Math.atan2(1, cotIdeal);
  const denom = ideal - outer;
  if (Math.abs(denom) < 1e-12) return null;
  return ((inner - outer) / denom) * 100;
}

/** The straight-ahead pose of an axle at design height: the rack position where δ̄ = 0, each wheel's steer there (static toe), and the steering axes' ground-point distance t_s. */
export interface StraightAhead {
  rackMm: number;
  leftSteerDeg: number;
  rightSteerDeg: number;
  /** Distance between the left and right steering axes' ground points, mm (null: an axis parallel to the ground). */
  steeringAxisTrackMm: number | null;
}

/** Where the kingpin axis of a solved side meets the ground plane through its contact patch (left frame), mm. */
function steeringAxisGroundPoint(s: CornerSolver): [number, number] {
  const k = kingpinAxis(s);
  const cpz = poseOutputs(s).contactPatch[2];
  const g = (cpz - k.point[2]) / k.dir[2];
  return [k.point[0] + g * k.dir[0], k.point[1] + g * k.dir[1]];
}

/** The straight-ahead pose (Newton on the rack for δ̄ = 0 at design height; rack 0 for a symmetric axle). */
export function straightAhead(sides: AxleSides): StraightAhead {
  const [lo, hi] = axleStroke(sides);
  let rack = 0;
  let p = solveBoth(sides, 0, 0, rack);
  for (let it = 0; it < 50; it++) {
    const f = (p.l.steerDeg + p.r.steerDeg) / 2;
    if (Math.abs(f) < 1e-10) break;
    const d = (steerPerRack(sides.left) + steerPerRack(sides.right)) / 2;
    if (!(Math.abs(d) > 1e-12)) break;
    const next = Math.min(hi, Math.max(lo, rack - f / d));
    if (next === rack) break;
    rack = next;
    p = solveBoth(sides, 0, 0, rack);
  }
  const gl = steeringAxisGroundPoint(sides.left);
  const gr = steeringAxisGroundPoint(sides.right);
  // The right side is solved in the mirrored frame: its ground point is (x, −y) in the vehicle frame.
  const ts = Math.hypot(gl[0] - gr[0], gl[1] + gr[1]);
  return { rackMm: rack, leftSteerDeg: p.l.steerDeg, rightSteerDeg: p.r.steerDeg, steeringAxisTrackMm: Number.isFinite(ts) ? ts : null };
}

/** The Ackermann definition in words, for outputs. */
export const ACKERMANN_DEFINITION =
  'steer angles measured from the straight-ahead pose (static toe removed); 100 % when the inner angle is the ideal one for the outer, cot δo − cot δi = t_s/L, with t_s the distance between the steering axes\' ground points';

function solveBoth(sides: AxleSides, travelL: number, travelR: number, rack: number): { l: PoseResult; r: PoseResult } {
  sides.left.reset();
  sides.left.solve(0, 0);
  sides.left.solveTowards(travelL, rack);
  sides.right.reset();
  sides.right.solve(0, 0);
  sides.right.solveTowards(travelR, rack);
  return { l: poseOutputs(sides.left), r: poseOutputs(sides.right) };
}

/** Full axle analysis at design height (and the given rack position). */
export function axleKinematics(corner: Corner, options: AxleKinematicsOptions = {}) {
  const sides = axleSides(corner, options.rightCorner);
  const rack = options.rackMm ?? 0;
  checkAxleRack(sides, [rack], 'rackMm');
  const { l, r } = solveBoth(sides, 0, 0, rack);
  const icL = frontViewIc(sides.left);
  const icR = frontViewIc(sides.right);
  const rc = rollCentreOf(icL, icR);
  const sv = sideViewIc(sides.left);
  let anti: Record<string, number> | null = null;
  if (options.anti) {
    const a = options.anti;
    if (!(a.cgHeightMm > 0)) throw new InputError('anti.cgHeightMm must be positive', [{ path: 'anti.cgHeightMm', message: 'must be positive' }]);
    if (!(a.wheelbaseMm > 0)) throw new InputError('anti.wheelbaseMm must be positive', [{ path: 'anti.wheelbaseMm', message: 'must be positive' }]);
    const k = a.wheelbaseMm / a.cgHeightMm;
    const bf = a.brakeFrontFraction ?? 0.6;
    const df = a.driveFrontFraction ?? 0;
    // Anti-dive / anti-lift / anti-squat: tanθ·(L/h)·share·100 (Gillespie ch. 9, from memory); rear tan from the front-view sign flipped.
    if (a.axle === 'front') {
      anti = { antiDivePercent: sv.tanFromContactPatchFront * k * bf * 100, antiLiftDrivePercent: sv.tanFromWheelCentreFront * k * df * 100 };
    } else {
      anti = { antiLiftPercent: -sv.tanFromContactPatchFront * k * (1 - bf) * 100, antiSquatPercent: -sv.tanFromWheelCentreFront * k * (1 - df) * 100 };
    }
  }
  let steering: null | {
    rows: SteeringRow[];
    steeringRatioDegPerMm: number;
    overallRatio: number | null;
    straightAhead: StraightAhead;
    ackermannDefinition: string;
  } = null;
  if (corner.steered) {
    const [lo, hi] = axleStroke(sides);
    const n = Math.max(3, Math.min(201, options.steeringPoints ?? 21));
    const sa = straightAhead(sides);
    const rows: SteeringRow[] = [];
    for (let i = 0; i < n; i++) {
      const rk = lo + ((hi - lo) * i) / (n - 1);
      const p = solveBoth(sides, 0, 0, rk);
      const axleSteerDeg = (p.l.steerDeg + p.r.steerDeg) / 2;
      rows.push({
        rackMm: rk,
        leftSteerDeg: p.l.steerDeg,
        rightSteerDeg: p.r.steerDeg,
        axleSteerDeg,
        ackermannPercent: options.wheelbaseMm ? ackermannPercent(p.l.steerDeg - sa.leftSteerDeg, p.r.steerDeg - sa.rightSteerDeg, sa.steeringAxisTrackMm, options.wheelbaseMm) : null,
      });
    }
    solveBoth(sides, 0, 0, 0);
    const ratio = (steerPerRack(sides.left) + steerPerRack(sides.right)) / 2;
    steering = {
      rows,
      steeringRatioDegPerMm: ratio,
      overallRatio: options.rackMmPerHandwheelRev ? 360 / options.rackMmPerHandwheelRev / Math.abs(ratio) : null,
      straightAhead: sa,
      ackermannDefinition: ACKERMANN_DEFINITION,
    };
  }
  return {
    trackMm: sides.trackMm,
    rackMm: rack,
    left: { frontViewIc: { yMm: icL.yMm, zMm: icL.zMm }, toeDeg: l.toeDeg, camberDeg: l.camberDeg, steerDeg: l.steerDeg },
    right: { frontViewIc: { yMm: icR.yMm, zMm: icR.zMm }, toeDeg: r.toeDeg, camberDeg: r.camberDeg, steerDeg: r.steerDeg },
    rollCentreHeightMm: rc ? rc.heightMm : null,
    rollCentreYMm: rc ? rc.yMm : null,
    sideViewIc: { xMm: sv.xMm, zMm: sv.zMm },
    anti,
    steering,
  };
}

// ---------- roll ----------

export interface RollRow {
  rollDeg: number;
  rackMm: number;
  /** Wheel-centre travel of each side, mm (left −s, right +s). */
  leftTravelMm: number;
  rightTravelMm: number;
  leftSteerDeg: number;
  rightSteerDeg: number;
  /** Mean steer δ̄ = (δ_L + δ_R)/2, deg, positive to the left. */
  axleSteerDeg: number;
  leftToeDeg: number;
  rightToeDeg: number;
  /** Camber relative to the body, deg. */
  leftCamberDeg: number;
  rightCamberDeg: number;
  /** (γ_out − γ_in)/2 with γ_out = γ_R + φ, γ_in = γ_L − φ (domain.md): mean lean of the wheel tops relative to the ground toward −y (the outside of a left turn, φ > 0), deg. */
  rollCamberDeg: number;
  /** Kinematic roll centre in the body frame, mm; null when the lines are parallel. */
  rollCentreHeightMm: number | null;
  rollCentreYMm: number | null;
  /** Ackermann percentage at this roll (needs wheelbaseMm and a steered axle off centre). */
  ackermannPercent: number | null;
}

export interface RollRackSummary {
  rackMm: number;
  /** ε = −dδ̄/dφ at φ = 0, deg/deg (positive: the axle steers out of the turn). */
  rollSteerCoefficient: number;
  /** Roll camber coefficient at φ = 0 (domain.md), deg per deg of roll. */
  rollCamberDegPerDeg: number;
}

export interface RollSweepOptions {
  roll: Range;
  rackMm?: number[] | undefined;
  rightCorner?: unknown | undefined;
  wheelbaseMm?: number | undefined;
}

/** ε and roll camber at φ = 0 for one rack position, from the analytic tangents. */
function rollCoefficients(sides: AxleSides, rack: number): { eps: number; rollCamber: number; l: PoseResult; r: PoseResult } {
  const { l, r } = solveBoth(sides, 0, 0, rack);
  const half = sides.trackMm / 2;
  // ds/dφ = t/2 per rad; left travel −s, right +s (domain.md). Rates in deg/mm → deg/rad, then per degree.
  const dMean = ((-steerRatePerMm(l) + steerRatePerMm(r)) / 2) * half / DEG_PER_RAD;
  const gL = l.camberGradientDegPerM / 1000;
  const gR = r.camberGradientDegPerM / 1000;
  // d/dφ[(γ_R(+s) + φ − γ_L(−s) + φ)/2]
  const rollCamber = 1 + ((gR + gL) / 2) * half / DEG_PER_RAD;
  return { eps: -dMean, rollCamber, l, r };
}

/** ε = −dδ̄/dφ at φ = 0 (deg/deg), domain.md. */
export function rollSteerCoefficient(corner: Corner, rackMm = 0, rightCorner?: unknown): number {
  const sides = axleSides(corner, rightCorner);
  checkAxleRack(sides, [rackMm], 'rackMm');
  return rollCoefficients(sides, rackMm).eps;
}

/** Roll sweep: body roll φ with heave held at zero, s = (t/2)·sin φ. */
export function rollSweep(corner: Corner, options: RollSweepOptions) {
  const sides = axleSides(corner, options.rightCorner);
  const rolls = expandRange(options.roll, 'roll');
  if (rolls.some((p) => Math.abs(p) >= 45)) throw new InputError('roll: angles must lie within ±45 deg', [{ path: 'roll', message: 'outside ±45 deg' }]);
  const racks = options.rackMm && options.rackMm.length ? options.rackMm : [0];
  checkAxleRack(sides, racks, 'rackMm');
  const half = sides.trackMm / 2;
  const rows: RollRow[] = [];
  const byRack: RollRackSummary[] = [];
  // Continuation outward from φ nearest 0, each side by its own solver.
  let start = 0;
  for (let i = 1; i < rolls.length; i++) if (Math.abs(rolls[i]!) < Math.abs(rolls[start]!)) start = i;
  /** The rows at one rack position; `solved`: the sides already stand at (0, 0, rack). */
  const block = (rack: number, solved = false): RollRow[] => {
    const out = new Array<RollRow>(rolls.length);
    const at = (i: number) => {
      const phi = rolls[i]!;
      const s = half * Math.sin(phi / DEG_PER_RAD);
      sides.left.solveTowards(-s, rack);
      sides.right.solveTowards(s, rack);
      const l = poseOutputs(sides.left);
      const r = poseOutputs(sides.right);
      const rc = rollCentreOf(frontViewIc(sides.left), frontViewIc(sides.right));
      out[i] = {
        rollDeg: phi,
        rackMm: rack,
        leftTravelMm: -s,
        rightTravelMm: s,
        leftSteerDeg: l.steerDeg,
        rightSteerDeg: r.steerDeg,
        axleSteerDeg: (l.steerDeg + r.steerDeg) / 2,
        leftToeDeg: l.toeDeg,
        rightToeDeg: r.toeDeg,
        leftCamberDeg: l.camberDeg,
        rightCamberDeg: r.camberDeg,
        rollCamberDeg: (r.camberDeg + phi - (l.camberDeg - phi)) / 2,
        rollCentreHeightMm: rc ? rc.heightMm : null,
        rollCentreYMm: rc ? rc.yMm : null,
        ackermannPercent: null,
      };
    };
    if (!solved) solveBoth(sides, 0, 0, rack);
    for (let i = start; i < rolls.length; i++) at(i);
    solveBoth(sides, -half * Math.sin(rolls[start]! / DEG_PER_RAD), half * Math.sin(rolls[start]! / DEG_PER_RAD), rack);
    for (let i = start - 1; i >= 0; i--) at(i);
    return out;
  };
  const blocks: RollRow[][] = [];
  for (const rack of racks) {
    const co = rollCoefficients(sides, rack);
    byRack.push({ rackMm: rack, rollSteerCoefficient: co.eps, rollCamberDegPerDeg: co.rollCamber });
    blocks.push(block(rack, true));
  }
  if (options.wheelbaseMm && corner.steered) {
    // Ackermann at each roll: steer measured from the straight-ahead rack at the same wheel travels (static toe
    // and roll steer removed), with t_s of the straight-ahead pose at design height.
    const sa = straightAhead(sides);
    const k = racks.indexOf(sa.rackMm);
    const ref = k >= 0 ? blocks[k]! : block(sa.rackMm);
    for (const b of blocks) {
      b.forEach((row, i) => {
        row.ackermannPercent = ackermannPercent(row.leftSteerDeg - ref[i]!.leftSteerDeg, row.rightSteerDeg - ref[i]!.rightSteerDeg, sa.steeringAxisTrackMm, options.wheelbaseMm!);
      });
    }
  }
  for (const b of blocks) rows.push(...b);
  const main = byRack.find((b) => b.rackMm === 0) ?? byRack[0]!;
  return {
    rows,
    trackMm: sides.trackMm,
    rollSteerCoefficient: main.rollSteerCoefficient,
    rollCamberDegPerDeg: main.rollCamberDegPerDeg,
    byRack,
  };
}

export interface AxleSummary {
  rollSteerCoefficient: number;
  rollCamberDegPerDeg: number;
  rollCentreHeightMm: number;
  trackMm: number;
  /** Toe-in gradient at design height, deg/m (mean of both sides). */
  bumpSteerDegPerM: number;
  /** Mechanical trail at the ground, mm (mean of both sides; positive when the steering axis meets the ground ahead of the contact patch). */
  mechanicalTrailMm: number;
  springMotionRatio?: number;
  /** Bar lever-end travel per unit wheel travel (mm/mm), tied to the corner's own lever radius. */
  barMotionRatio?: number;
  /** Bar twist per unit wheel travel, rad/m (mean of both sides): what the bar's roll stiffness needs. */
  barTwistRadPerM?: number;
  /** The corner's bar lever radius (bar axis to the drop link's inner end), mm. */
  barLeverMm?: number;
}

/** What the balance model takes from an axle's kinematics (design height, given rack). */
export function axleSummary(corner: Corner, options: { rackMm?: number; rightCorner?: unknown } = {}): AxleSummary {
  const sides = axleSides(corner, options.rightCorner);
  const rack = options.rackMm ?? 0;
  checkAxleRack(sides, [rack], 'rackMm');
  const co = rollCoefficients(sides, rack);
  const rc = rollCentreOf(frontViewIc(sides.left), frontViewIc(sides.right));
  if (!rc) {
    throw new SolveError('singular_geometry', 'The roll centre is at infinity (the contact-patch-to-instant-centre lines are parallel)', { rackMm: rack });
  }
  const out: AxleSummary = {
    rollSteerCoefficient: co.eps,
    rollCamberDegPerDeg: co.rollCamber,
    rollCentreHeightMm: rc.heightMm,
    trackMm: sides.trackMm,
    bumpSteerDegPerM: (co.l.toeGradientDegPerM + co.r.toeGradientDegPerM) / 2,
    mechanicalTrailMm: (co.l.mechanicalTrailMm + co.r.mechanicalTrailMm) / 2,
  };
  if (co.l.motionRatio !== undefined && co.r.motionRatio !== undefined) out.springMotionRatio = (co.l.motionRatio + co.r.motionRatio) / 2;
  if (co.l.barMotionRatio !== undefined && co.r.barMotionRatio !== undefined) out.barMotionRatio = (co.l.barMotionRatio + co.r.barMotionRatio) / 2;
  if (co.l.barTwistRadPerM !== undefined && co.r.barTwistRadPerM !== undefined) {
    out.barTwistRadPerM = (co.l.barTwistRadPerM + co.r.barTwistRadPerM) / 2;
    out.barLeverMm = sides.left.model.bar!.leverRadius;
  }
  return out;
}

/** Rack position (mm) at which the axle's mean steer angle δ̄ equals `axleSteerDeg` at design height (Newton on the analytic steering rate). */
export function rackForAxleSteer(corner: Corner, axleSteerDeg: number, rightCorner?: unknown): number {
  const sides = axleSides(corner, rightCorner);
  if (!corner.steered) throw new InputError('corner: not steered, so no rack position steers it', [{ path: 'corner.steered', message: 'corner not steered' }]);
  const [lo, hi] = axleStroke(sides);
  let rack = 0;
  for (let it = 0; it < 50; it++) {
    const { l, r } = solveBoth(sides, 0, 0, rack);
    const f = (l.steerDeg + r.steerDeg) / 2 - axleSteerDeg;
    if (Math.abs(f) < 1e-10) return rack;
    const d = (steerPerRack(sides.left) + steerPerRack(sides.right)) / 2;
    if (!(Math.abs(d) > 1e-12)) break;
    let next = rack - f / d;
    next = Math.min(hi, Math.max(lo, next));
    if (next === rack) break;
    rack = next;
  }
  throw new SolveError('unreachable_pose', `No rack position within the stroke [${lo}, ${hi}] mm gives a mean steer of ${axleSteerDeg} deg`, {
    axleSteerDeg,
    rackStroke: [lo, hi],
  });
}

