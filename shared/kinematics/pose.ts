/**
 * Per-pose outputs from a solved CornerSolver state, with the conventions of
 * domain.md (ISO 8855, toe-in positive, camber positive top outboard, steer
 * positive to the left). Derivatives (gradients, motion ratios) come from the
 * solver's analytic pose tangents, not finite differences.
 */
import { SolveError } from '../errors.js';
import type { Vec3, Attachment } from '../schema/corner.js';
import type { CornerModel, LeverModel } from './model.js';
import type { CornerSolver } from './solver.js';
import { add, cross, dot, norm, sub, scale, RAD, rotateAbout } from './vec.js';

export interface PoseResult {
  /** Wheel-centre travel from design, mm (+ bump). */
  travelMm: number;
  /** Steering input, mm (rack travel toward +y; arc travel for a steering-box arm). */
  rackMm: number;
  side: 'left' | 'right';
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

/** A point on an arm (rotating about its pivot axis) or the upright: position and velocity per mm of travel. */
function attachedPoint(s: CornerSolver, on: Attachment, pDesign: Vec3): { p: Vec3; v: Vec3 } {
  const m = s.model;
  if (on === 'upright') return uprightPoint(s, pDesign, s.tTravel);
  const arm = on === 'lowerArm' ? m.lowerArm : m.upperArm;
  const outerLocal = on === 'lowerArm' ? m.lowerOuterLocal : m.upperOuterLocal;
  if (!arm || !outerLocal) throw new SolveError('singular_geometry', `no ${on} on a ${m.corner.type} corner`, { attachment: on });
  const jo = uprightPoint(s, add(outerLocal, m.wc0), s.tTravel);
  const d = sub(jo.p, arm.pivot);
  const r1 = sub(d, scale(arm.axis, dot(d, arm.axis)));
  const th = Math.atan2(dot(cross(arm.r0, r1), arm.axis), dot(arm.r0, r1));
  const p = add(arm.pivot, rotateAbout(sub(pDesign, arm.pivot), arm.axis, th));
  // Arm angular rate α from the ball joint's velocity: v = α·u × r1.
  const alpha = dot(jo.v, cross(arm.axis, r1)) / dot(r1, r1);
  const v = scale(cross(arm.axis, sub(p, arm.pivot)), alpha);
  return { p, v };
}

/**
 * Lever angle θ about its axis so the driving link closes: A·cosθ + B·sinθ = C,
 * the root nearest the previous angle. Throws SolveError if the link cannot reach.
 */
function leverAngle(s: CornerSolver, lv: LeverModel, o: Vec3, prev: number): number {
  const q2 = cross(lv.axis, lv.leverPerp);
  const D = sub(add(lv.pivot, lv.leverPar), o);
  const A = 2 * dot(D, lv.leverPerp);
  const B = 2 * dot(D, q2);
  const C = lv.linkLength * lv.linkLength - dot(D, D) - lv.leverRadius * lv.leverRadius;
  const h = Math.hypot(A, B);
  if (!(h > 0) || Math.abs(C) > h) {
    throw new SolveError('unreachable_pose', `Pose unreachable at travel ${s.travelMm} mm, rack ${s.rackMm} mm: the ${lv.what} cannot reach its lever`, {
      travelMm: s.travelMm,
      rackMm: s.rackMm,
      side: s.side,
      link: lv.what,
      field: lv.linkField,
    });
  }
  const base = Math.atan2(B, A);
  const off = Math.acos(C / h);
  const wrap = (t: number) => t - 2 * Math.PI * Math.round((t - prev) / (2 * Math.PI));
  const t1 = wrap(base + off);
  const t2 = wrap(base - off);
  return Math.abs(t1 - prev) <= Math.abs(t2 - prev) ? t1 : t2;
}

function leverPoint(lv: LeverModel, par: Vec3, perp: Vec3, th: number): Vec3 {
  return add(add(lv.pivot, par), rotateAbout(perp, lv.axis, th));
}

/** Lever state: angle, the lever point and the angular rate per mm of travel. */
function leverState(s: CornerSolver, lv: LeverModel, prev: number) {
  const o = attachedPoint(s, lv.linkOuterOn, lv.linkOuter);
  const th = leverAngle(s, lv, o.p, prev);
  const q = leverPoint(lv, lv.leverPar, lv.leverPerp, th);
  const qo = sub(q, o.p);
  // d/dθ of |Q − O|² balances d/dO: dθ = (Q−O)·v_O / ((Q−O)·(w × (Q − K)))
  const rate = dot(qo, o.v) / dot(qo, cross(lv.axis, sub(q, lv.pivot)));
  return { th, rate };
}

/** Steer angle of the mirror-frame spin axis a: δ_m = atan2(−a_x, a_y), and its rate for da. */
function steerOf(a: Vec3): number {
  return Math.atan2(-a[0], a[1]);
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

/** All per-pose outputs for the solver's current (converged) pose. */
export function poseOutputs(s: CornerSolver): PoseResult {
  const m = s.model;
  const R = s.R;
  const a = mul(R, m.spin0);
  const wt: Vec3 = [s.tTravel[3]!, s.tTravel[4]!, s.tTravel[5]!];
  const da = cross(wt, a);
  const dm = steerOf(a);
  const ddm = (a[0] * da[1] - a[1] * da[0]) / (a[0] * a[0] + a[1] * a[1]);
  const right = s.side === 'right';
  // Contact patch: wheel centre + R·unit(projection of −ẑ on the wheel plane).
  const dn: Vec3 = [a[2] * a[0], a[2] * a[1], -1 + a[2] * a[2]];
  const cp = add(s.c, scale(dn, m.radius / norm(dn)));
  const wc: Vec3 = [s.c[0]!, s.c[1]!, s.c[2]!];

  const kp = kingpinAxis(s);
  const k = kp.dir;
  const G = add(kp.point, scale(k, (cp[2] - kp.point[2]) / k[2]));
  const hn = Math.hypot(a[0], a[1]);
  const h: Vec3 = [a[1] / hn, -a[0] / hn, 0];
  const nOut: Vec3 = [-h[1], h[0], 0];

  const out: PoseResult = {
    travelMm: s.travelMm,
    rackMm: s.rackMm,
    side: s.side,
    toeDeg: -dm * RAD,
    camberDeg: -Math.asin(a[2]) * RAD,
    steerDeg: (right ? -dm : dm) * RAD,
    wheelCentre: right ? [wc[0], -wc[1], wc[2]] : wc,
    contactPatch: right ? [cp[0], -cp[1], cp[2]] : cp,
    halfTrackChangeMm: cp[1] - m.cp0[1],
    wheelCentreShiftXMm: wc[0] - m.wc0[0],
    kingpinInclinationDeg: Math.atan2(-k[1], k[2]) * RAD,
    casterDeg: Math.atan2(-k[0], k[2]) * RAD,
    scrubRadiusMm: dot(sub(cp, G), nOut),
    mechanicalTrailMm: dot(sub(G, cp), h),
    toeGradientDegPerM: -ddm * RAD * 1000,
    camberGradientDegPerM: (-da[2] / Math.sqrt(1 - a[2] * a[2])) * RAD * 1000,
    diagnostics: { converged: true, iterations: s.iterations, residualMm: s.residualMm },
  };

  if (m.directSpring) {
    const o = attachedPoint(s, m.directSpring.on, m.directSpring.outer);
    const d = sub(o.p, m.directSpring.body);
    const L = norm(d);
    out.springLengthMm = L;
    out.motionRatio = -dot(d, o.v) / L;
  } else if (m.rocker) {
    const lv = m.rocker;
    const st = leverState(s, lv, s.rockerAngle);
    s.rockerAngle = st.th;
    const sp = leverPoint(lv, lv.springPar!, lv.springPerp!, st.th);
    const d = sub(sp, lv.springBody!);
    const L = norm(d);
    out.springLengthMm = L;
    out.motionRatio = -(dot(d, cross(lv.axis, sub(sp, lv.pivot))) / L) * st.rate;
  }
  if (m.bar) {
    const st = leverState(s, m.bar, s.barAngle);
    s.barAngle = st.th;
    out.barMotionRatio = Math.abs(st.rate) * m.bar.leverRadius;
    out.barTwistRadPerM = Math.abs(st.rate) * 1000;
  }
  return out;
}
