/**
 * Per-pose outputs from a solved CornerSolver state, with the conventions of
 * domain.md (ISO 8855, toe-in positive, camber positive top outboard, steer
 * positive to the left). Derivatives (gradients, motion ratios) come from the
 * solver's analytic pose tangents, not finite differences.
 */
import { SolveError } from '../errors.js';
import type { Vec3 } from '../schema/corner.js';
import type { Attachment } from '../schema/corner-rules.js';
import type { ArmModel, LeverModel } from './model.js';
import type { CornerSolver } from './solver.js';
import { add, cross, dot, norm, sub, scale, rotateOffsetCsInto } from './vec.js';
import { DEG_PER_RAD } from '../angles.js';

export interface PoseRow {
  /** Wheel-centre travel from design, mm (+ bump). */
  travelMm: number;
  /** Steering input, mm (rack travel toward +y; arc travel for a steering-box arm). */
  rackMm: number;
  /** Toe, deg, toe-in positive. */
  toeDeg: number;
  /** Camber relative to the body, deg, top leaning outboard positive. */
  camberDeg: number;
  /** Steer angle, deg, positive to the left (counter-clockwise from above). */
  steerDeg: number;
  /** Wheel centre in the vehicle frame (this side's real coordinates), mm. */
  wheelCentre: Vec3;
  /** Contact patch in the vehicle frame, mm. */
  contactPatch: Vec3;
  /** Contact-patch lateral move, mm, positive outboard. */
  halfTrackChangeMm: number;
  /** Wheel-centre fore-aft move, mm, positive forward. */
  wheelCentreShiftXMm: number;
  /** Kingpin inclination, deg, top leaning inboard positive. */
  kingpinInclinationDeg: number;
  /** Caster, deg, top leaning rearward positive. */
  casterDeg: number;
  /** Scrub radius at the ground, mm, positive when the kingpin meets the ground inboard of the contact patch. */
  scrubRadiusMm: number;
  /** Mechanical trail, mm, positive when the kingpin meets the ground ahead of the contact patch. */
  mechanicalTrailMm: number;
  /** Toe gradient at this pose, deg/m, toe-in per metre of bump. */
  toeGradientDegPerM: number;
  /** Camber gradient at this pose, deg/m of bump. */
  camberGradientDegPerM: number;
  /** Spring (or spring/damper) length, mm; present when a spring is given. */
  springLengthMm?: number;
  /** Spring compression per unit wheel bump (mm/mm). */
  motionRatio?: number;
  /** Anti-roll bar lever-end travel per unit wheel travel (mm/mm). */
  barMotionRatio?: number;
  /** Anti-roll bar lever rotation per metre of wheel travel, rad/m. */
  barTwistRadPerM?: number;
  /** Newton iterations this pose took. */
  iterations: number;
}

export interface PoseResult extends PoseRow {
  side: 'left' | 'right';
  diagnostics: { converged: true; iterations: number; residualMm: number };
}

function mul(R: Float64Array, v: ArrayLike<number>): Vec3 {
  return [
    R[0]! * v[0]! + R[1]! * v[1]! + R[2]! * v[2]!,
    R[3]! * v[0]! + R[4]! * v[1]! + R[5]! * v[2]!,
    R[6]! * v[0]! + R[7]! * v[1]! + R[8]! * v[2]!,
  ];
}

/** Upright-fixed point with design position p (left frame): current position and its velocity per unit of the tangent. */
export function uprightPoint(s: CornerSolver, pDesign: ArrayLike<number>, tangent: Float64Array): { p: Vec3; v: Vec3 } {
  const d = mul(s.R, sub(pDesign, s.model.wc0));
  const p = add(s.c, d);
  const w: Vec3 = [tangent[3]!, tangent[4]!, tangent[5]!];
  const v = add([tangent[0]!, tangent[1]!, tangent[2]!], cross(w, d));
  return { p, v };
}

// Scratch for the per-pose mechanism outputs (single-threaded; no allocation per pose).
const att = new Float64Array(6);
const rot = new Float64Array(3);

/**
 * A point riding on an arm (turning about its pivot axis) or on the upright,
 * design position pDesign: writes its position and velocity per mm of
 * travel into `out` [x, y, z, vx, vy, vz].
 */
function attachInto(s: CornerSolver, on: Attachment, pDesign: Vec3, out: Float64Array): void {
  const m = s.model;
  const R = s.R;
  const c = s.c;
  const t = s.tTravel;
  const wx = t[3]!;
  const wy = t[4]!;
  const wz = t[5]!;
  let lx: number, ly: number, lz: number;
  let arm: ArmModel | null = null;
  if (on === 'upright') {
    lx = pDesign[0] - m.wc0[0];
    ly = pDesign[1] - m.wc0[1];
    lz = pDesign[2] - m.wc0[2];
  } else {
    arm = on === 'lowerArm' ? m.lowerArm : m.upperArm;
    const ol = on === 'lowerArm' ? m.lowerOuterLocal : m.upperOuterLocal;
    if (!arm || !ol) throw new SolveError('singular_geometry', `no ${on} on a ${m.corner.type} corner`, { attachment: on });
    lx = ol[0];
    ly = ol[1];
    lz = ol[2];
  }
  const dx = R[0]! * lx + R[1]! * ly + R[2]! * lz;
  const dy = R[3]! * lx + R[4]! * ly + R[5]! * lz;
  const dz = R[6]! * lx + R[7]! * ly + R[8]! * lz;
  const Px = c[0]! + dx;
  const Py = c[1]! + dy;
  const Pz = c[2]! + dz;
  const vx = t[0]! + wy * dz - wz * dy;
  const vy = t[1]! + wz * dx - wx * dz;
  const vz = t[2]! + wx * dy - wy * dx;
  if (!arm) {
    out[0] = Px;
    out[1] = Py;
    out[2] = Pz;
    out[3] = vx;
    out[4] = vy;
    out[5] = vz;
    return;
  }
  // Arm angle from its ball joint: θ between the design and current offsets from the pivot axis.
  const ux = arm.axis[0];
  const uy = arm.axis[1];
  const uz = arm.axis[2];
  const ex = Px - arm.pivot[0];
  const ey = Py - arm.pivot[1];
  const ez = Pz - arm.pivot[2];
  const ea = ex * ux + ey * uy + ez * uz;
  const r1x = ex - ea * ux;
  const r1y = ey - ea * uy;
  const r1z = ez - ea * uz;
  const r0x = arm.r0[0];
  const r0y = arm.r0[1];
  const r0z = arm.r0[2];
  const sn = (r0y * r1z - r0z * r1y) * ux + (r0z * r1x - r0x * r1z) * uy + (r0x * r1y - r0y * r1x) * uz;
  const cs = r0x * r1x + r0y * r1y + r0z * r1z;
  // Rotate the design point about the axis by θ, with cos θ and sin θ straight from (cs, sn) (no trig).
  const hs = 1 / Math.sqrt(sn * sn + cs * cs);
  rotateOffsetCsInto(rot, arm.axis, pDesign, arm.pivot, cs * hs, sn * hs);
  const rx = rot[0]!;
  const ry = rot[1]!;
  const rz = rot[2]!;
  // Arm rate α from the joint's velocity: v = α·u × r1.
  const alpha = (vx * (uy * r1z - uz * r1y) + vy * (uz * r1x - ux * r1z) + vz * (ux * r1y - uy * r1x)) / (r1x * r1x + r1y * r1y + r1z * r1z);
  out[0] = arm.pivot[0] + rx;
  out[1] = arm.pivot[1] + ry;
  out[2] = arm.pivot[2] + rz;
  out[3] = alpha * (uy * rz - uz * ry);
  out[4] = alpha * (uz * rx - ux * rz);
  out[5] = alpha * (ux * ry - uy * rx);
}

/**
 * Lever (rocker or bar lever) angle θ so its driving link closes:
 * A·cosθ + B·sinθ = C, the root nearest the previous angle (given by its
 * cosine and sine, `prev[k]`, `prev[k + 1]`, and updated there), and
 * dθ/dtravel (rad/mm), written to `lev` [rate, cosθ, sinθ]. Works on cos θ
 * and sin θ throughout (no trig calls). Throws SolveError if the link cannot
 * reach.
 */
const lev = new Float64Array(3);

function leverSolve(s: CornerSolver, lv: LeverModel, prev: Float64Array, k: number): void {
  attachInto(s, lv.linkOuterOn, lv.linkOuter, att);
  const wx = lv.axis[0];
  const wy = lv.axis[1];
  const wz = lv.axis[2];
  const px = lv.leverPerp[0];
  const py = lv.leverPerp[1];
  const pz = lv.leverPerp[2];
  const q2x = lv.leverPerpX[0];
  const q2y = lv.leverPerpX[1];
  const q2z = lv.leverPerpX[2];
  const Dx = lv.pivot[0] + lv.leverPar[0] - att[0]!;
  const Dy = lv.pivot[1] + lv.leverPar[1] - att[1]!;
  const Dz = lv.pivot[2] + lv.leverPar[2] - att[2]!;
  const A = 2 * (Dx * px + Dy * py + Dz * pz);
  const B = 2 * (Dx * q2x + Dy * q2y + Dz * q2z);
  const C = lv.linkLength * lv.linkLength - (Dx * Dx + Dy * Dy + Dz * Dz) - lv.leverRadius * lv.leverRadius;
  const h = Math.sqrt(A * A + B * B);
  if (!(h > 0) || Math.abs(C) > h) {
    throw new SolveError('unreachable_pose', `Pose unreachable at travel ${s.travelMm} mm, rack ${s.rackMm} mm: the ${lv.what} cannot reach its lever`, {
      travelMm: s.travelMm,
      rackMm: s.rackMm,
      side: s.side,
      link: lv.what,
      field: lv.linkField,
    });
  }
  // Roots θ = β ± γ with cos β = A/h, sin β = B/h, cos γ = C/h, sin γ ≥ 0.
  const cb = A / h;
  const sb = B / h;
  const cg = C / h;
  const sg = Math.sqrt(Math.max(0, 1 - cg * cg));
  const c1 = cb * cg - sb * sg;
  const s1 = sb * cg + cb * sg;
  const c2 = cb * cg + sb * sg;
  const s2 = sb * cg - cb * sg;
  // Branch continuity: the root nearer the previous angle has the larger cos(θ − θprev) (ties to β + γ).
  const cp = prev[k]!;
  const sp = prev[k + 1]!;
  const first = c1 * cp + s1 * sp >= c2 * cp + s2 * sp;
  const co = first ? c1 : c2;
  const si = first ? s1 : s2;
  // Lever point Q − pivot = par + cosθ·perp + sinθ·(w × perp); its velocity per dθ is w × (Q − pivot).
  const ox = lv.leverPar[0] + co * px + si * q2x;
  const oy = lv.leverPar[1] + co * py + si * q2y;
  const oz = lv.leverPar[2] + co * pz + si * q2z;
  const qox = lv.pivot[0] + ox - att[0]!;
  const qoy = lv.pivot[1] + oy - att[1]!;
  const qoz = lv.pivot[2] + oz - att[2]!;
  const num = qox * att[3]! + qoy * att[4]! + qoz * att[5]!;
  const den = qox * (wy * oz - wz * oy) + qoy * (wz * ox - wx * oz) + qoz * (wx * oy - wy * ox);
  prev[k] = co;
  prev[k + 1] = si;
  lev[0] = num / den;
  lev[1] = co;
  lev[2] = si;
}

export interface KingpinAxis {
  point: Vec3;
  /** Unit direction, pointing up. */
  dir: Vec3;
}

/** Kingpin (steering) axis in the left frame: ball joints, strut top to lower joint, or the instantaneous steering axis (five-link). */
export function kingpinAxis(s: CornerSolver): KingpinAxis {
  const m = s.model;
  const kp = m.kingpin;
  let p: Vec3, q: Vec3;
  if (kp.kind === 'points') {
    p = uprightPoint(s, add(kp.lowerLocal, m.wc0), s.tTravel).p;
    q = uprightPoint(s, add(kp.upperLocal, m.wc0), s.tTravel).p;
  } else if (kp.kind === 'strut') {
    p = uprightPoint(s, add(kp.lowerLocal, m.wc0), s.tTravel).p;
    q = kp.top;
  } else {
    // Screw axis of the steering motion: direction ω, point c + ω × v_c / |ω|².
    const t = s.tSteer;
    const w: Vec3 = [t[3]!, t[4]!, t[5]!];
    const w2 = dot(w, w);
    if (!(w2 > 0)) throw new SolveError('singular_geometry', 'the toe link does not steer the upright: no steering axis', { travelMm: s.travelMm });
    p = add(s.c, scale(cross(w, [t[0]!, t[1]!, t[2]!]), 1 / w2));
    q = add(p, w);
  }
  let dir = sub(q, p);
  dir = scale(dir, (dir[2] < 0 ? -1 : 1) / norm(dir));
  return { point: p, dir };
}

/** Slots of wheelStateInto's output. */
export const WHEEL_TOE = 0;
export const WHEEL_CAMBER = 1;
export const WHEEL_TOE_GRADIENT = 2;
export const WHEEL_CAMBER_GRADIENT = 3;
/** Contact patch x, y, z in the left frame (slots 4 to 6), mm. */
export const WHEEL_CP = 4;
/** Spin axis a = R·a0 (slots 7 to 9). */
const WHEEL_SPIN = 7;

/**
 * The wheel's state at the solver's pose, as poseRow reports it, without
 * building a row: toe and camber (deg), their gradients (deg/m of bump),
 * the contact patch in the left frame (mm) and the spin axis, written to
 * out (10 slots, WHEEL_* above). For per-sample loops that need a few
 * outputs of many poses.
 */
export function wheelStateInto(s: CornerSolver, out: Float64Array): void {
  const m = s.model;
  const R = s.R;
  const c = s.c;
  const s0 = m.spin0;
  // Spin axis a = R·a0 and its rate da = ω_t × a.
  const ax = R[0]! * s0[0] + R[1]! * s0[1] + R[2]! * s0[2];
  const ay = R[3]! * s0[0] + R[4]! * s0[1] + R[5]! * s0[2];
  const az = R[6]! * s0[0] + R[7]! * s0[1] + R[8]! * s0[2];
  const wx = s.tTravel[3]!;
  const wy = s.tTravel[4]!;
  const wz = s.tTravel[5]!;
  const dax = wy * az - wz * ay;
  const day = wz * ax - wx * az;
  const daz = wx * ay - wy * ax;
  const hn2 = ax * ax + ay * ay;
  const dm = Math.atan2(-ax, ay);
  const ddm = (ax * day - ay * dax) / hn2;
  // Contact patch: wheel centre + R·unit(projection of −ẑ on the wheel plane).
  const nx = az * ax;
  const ny = az * ay;
  const nz = -1 + az * az;
  const f = m.radius / Math.sqrt(nx * nx + ny * ny + nz * nz);
  out[WHEEL_TOE] = -dm * DEG_PER_RAD;
  out[WHEEL_CAMBER] = -Math.asin(az) * DEG_PER_RAD;
  out[WHEEL_TOE_GRADIENT] = -ddm * DEG_PER_RAD * 1000;
  out[WHEEL_CAMBER_GRADIENT] = (-daz / Math.sqrt(1 - az * az)) * DEG_PER_RAD * 1000;
  out[WHEEL_CP] = c[0]! + f * nx;
  out[WHEEL_CP + 1] = c[1]! + f * ny;
  out[WHEEL_CP + 2] = c[2]! + f * nz;
  out[WHEEL_SPIN] = ax;
  out[WHEEL_SPIN + 1] = ay;
  out[WHEEL_SPIN + 2] = az;
}

const wheel = new Float64Array(10);

/** Per-pose outputs as a sweep row (no side, no diagnostics object), computed with scalar arithmetic. */
export function poseRow(s: CornerSolver): PoseRow {
  const m = s.model;
  const R = s.R;
  const c = s.c;
  wheelStateInto(s, wheel);
  const ax = wheel[WHEEL_SPIN]!;
  const ay = wheel[WHEEL_SPIN + 1]!;
  const toeDeg = wheel[WHEEL_TOE]!;
  const right = s.side === 'right';
  const cpx = wheel[WHEEL_CP]!;
  const cpy = wheel[WHEEL_CP + 1]!;
  const cpz = wheel[WHEEL_CP + 2]!;

  // Kingpin axis (unit, pointing up) through point (kx, ky, kz).
  let kx: number, ky: number, kz: number, ux: number, uy: number, uz: number;
  const kp = m.kingpin;
  if (kp.kind === 'instant') {
    // Screw axis of the steering motion (as kingpinAxis, in scalars): direction ω, point c + ω × v_c / |ω|².
    const t = s.tSteer;
    const ox = t[3]!;
    const oy = t[4]!;
    const oz = t[5]!;
    const w2 = ox * ox + oy * oy + oz * oz;
    if (!(w2 > 0)) throw new SolveError('singular_geometry', 'the toe link does not steer the upright: no steering axis', { travelMm: s.travelMm });
    kx = c[0]! + (oy * t[2]! - oz * t[1]!) / w2;
    ky = c[1]! + (oz * t[0]! - ox * t[2]!) / w2;
    kz = c[2]! + (ox * t[1]! - oy * t[0]!) / w2;
    const un = (oz < 0 ? -1 : 1) / Math.sqrt(w2);
    ux = ox * un;
    uy = oy * un;
    uz = oz * un;
  } else {
    const l = kp.lowerLocal;
    kx = c[0]! + R[0]! * l[0] + R[1]! * l[1] + R[2]! * l[2];
    ky = c[1]! + R[3]! * l[0] + R[4]! * l[1] + R[5]! * l[2];
    kz = c[2]! + R[6]! * l[0] + R[7]! * l[1] + R[8]! * l[2];
    if (kp.kind === 'points') {
      const u = kp.upperLocal;
      ux = c[0]! + R[0]! * u[0] + R[1]! * u[1] + R[2]! * u[2] - kx;
      uy = c[1]! + R[3]! * u[0] + R[4]! * u[1] + R[5]! * u[2] - ky;
      uz = c[2]! + R[6]! * u[0] + R[7]! * u[1] + R[8]! * u[2] - kz;
    } else {
      ux = kp.top[0] - kx;
      uy = kp.top[1] - ky;
      uz = kp.top[2] - kz;
    }
    const un = (uz < 0 ? -1 : 1) / Math.sqrt(ux * ux + uy * uy + uz * uz);
    ux *= un;
    uy *= un;
    uz *= un;
  }
  // Kingpin meets the ground plane through the contact patch at G; wheel heading h and outboard n in that plane.
  const g = (cpz - kz) / uz;
  const Gx = kx + g * ux;
  const Gy = ky + g * uy;
  const hn = Math.sqrt(ax * ax + ay * ay);
  const hx = ay / hn;
  const hy = -ax / hn;

  const out: PoseRow = {
    travelMm: s.travelMm,
    rackMm: s.rackMm,
    toeDeg,
    camberDeg: wheel[WHEEL_CAMBER]!,
    steerDeg: right ? toeDeg : -toeDeg,
    wheelCentre: [c[0]!, right ? -c[1]! : c[1]!, c[2]!],
    contactPatch: [cpx, right ? -cpy : cpy, cpz],
    halfTrackChangeMm: cpy - m.cp0[1],
    wheelCentreShiftXMm: c[0]! - m.wc0[0],
    kingpinInclinationDeg: Math.atan2(-uy, uz) * DEG_PER_RAD,
    casterDeg: Math.atan2(-ux, uz) * DEG_PER_RAD,
    scrubRadiusMm: (cpx - Gx) * -hy + (cpy - Gy) * hx,
    mechanicalTrailMm: (Gx - cpx) * hx + (Gy - cpy) * hy,
    toeGradientDegPerM: wheel[WHEEL_TOE_GRADIENT]!,
    camberGradientDegPerM: wheel[WHEEL_CAMBER_GRADIENT]!,
    iterations: s.iterations,
  };

  if (m.directSpring) {
    const sp = m.directSpring;
    attachInto(s, sp.on, sp.outer, att);
    const dx = att[0]! - sp.body[0];
    const dy = att[1]! - sp.body[1];
    const dz = att[2]! - sp.body[2];
    const L = Math.sqrt(dx * dx + dy * dy + dz * dz);
    out.springLengthMm = L;
    out.motionRatio = -(dx * att[3]! + dy * att[4]! + dz * att[5]!) / L;
  } else if (m.rocker) {
    const lv = m.rocker;
    leverSolve(s, lv, s.levers, 0);
    const rate = lev[0]!;
    const co = lev[1]!;
    const si = lev[2]!;
    const wx = lv.axis[0];
    const wy = lv.axis[1];
    const wz = lv.axis[2];
    const pp = lv.springPerp!;
    const px = lv.springPerpX!;
    // spring's rocker end relative to the pivot, and its rate per dθ (w × that)
    const ox = lv.springPar![0] + co * pp[0] + si * px[0];
    const oy = lv.springPar![1] + co * pp[1] + si * px[1];
    const oz = lv.springPar![2] + co * pp[2] + si * px[2];
    const dx = lv.pivot[0] + ox - lv.springBody![0];
    const dy = lv.pivot[1] + oy - lv.springBody![1];
    const dz = lv.pivot[2] + oz - lv.springBody![2];
    const L = Math.sqrt(dx * dx + dy * dy + dz * dz);
    out.springLengthMm = L;
    out.motionRatio = (-(dx * (wy * oz - wz * oy) + dy * (wz * ox - wx * oz) + dz * (wx * oy - wy * ox)) / L) * rate;
  }
  if (m.bar) {
    leverSolve(s, m.bar, s.levers, 2);
    out.barMotionRatio = Math.abs(lev[0]!) * m.bar.leverRadius;
    out.barTwistRadPerM = Math.abs(lev[0]!) * 1000;
  }
  return out;
}

/** All per-pose outputs for the solver's current (converged) pose, with side and diagnostics. */
export function poseOutputs(s: CornerSolver): PoseResult {
  const row = poseRow(s) as PoseResult;
  row.side = s.side;
  row.diagnostics = { converged: true, iterations: s.iterations, residualMm: s.residualMm };
  return row;
}
