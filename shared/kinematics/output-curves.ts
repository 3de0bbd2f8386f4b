/**
 * Every per-pose output of an axle as a curve against one sweep axis:
 * wheel travel (both wheels together, heave), steering input (rack travel
 * across its stroke) or body roll (left wheel −s, right +s, s = (t/2)·sin φ,
 * domain.md). Per-wheel outputs are the LEFT wheel's (the entered corner);
 * the axle outputs (roll centre, anti features, Ackermann) use both sides.
 *
 * Conventions: shared/docs/domain.md (ISO 8855 axes, mm, deg). Derivatives
 * (instant centres, motion ratios) come from the solver's analytic pose
 * tangents, as in axle.ts; nothing here differentiates numerically.
 */
import { InputError } from '../errors.js';
import type { Corner } from '../schema/corner.js';
import { ackermannPercent, axleSides, frontViewIc, rollCentreOf, sideViewIc, straightAhead, type AntiOptions, type AxleSides, type SideViewIc } from './axle.js';
import { poseOutputs } from './pose.js';
import { checkRack, expandRange, type Range } from './sweep.js';
import { DEG_PER_RAD } from '../angles.js';

export type OutputCurveAxis = 'travel' | 'steer' | 'roll';

export interface OutputCurveOptions {
  /** travel: wheel travel of both wheels (mm); steer: rack travel over the stroke (mm); roll: body roll (deg). */
  axis: OutputCurveAxis;
  /** travel (mm) or roll (deg) range; for the steer axis the rack range (default: the whole stroke in 20 steps). */
  range?: Range;
  /** Steering input held during a travel or roll sweep, mm (default 0). */
  rackMm?: number;
  /** Wheel travel of both wheels held during a steer sweep, mm (default 0). */
  travelMm?: number;
  rightCorner?: unknown;
  /** Needed for Ackermann. */
  wheelbaseMm?: number;
  /** Needed for the anti features. */
  anti?: AntiOptions;
}

/** One pose of the sweep. Per-wheel values are the left wheel's; null where the output is undefined at that pose. */
export interface OutputCurveRow {
  /** The sweep variable: travel mm, rack mm or roll deg. */
  x: number;
  leftTravelMm: number;
  rightTravelMm: number;
  rackMm: number;
  toeDeg: number;
  camberDeg: number;
  steerDeg: number;
  casterDeg: number;
  kingpinInclinationDeg: number;
  scrubRadiusMm: number;
  mechanicalTrailMm: number;
  halfTrackChangeMm: number;
  /** Wheel-centre fore-aft move from design, mm, + forward. */
  wheelbaseChangeMm: number;
  /** Spring compression per wheel bump, mm/mm (null without a spring). */
  springMotionRatio: number | null;
  /** Bar lever-end travel per wheel travel, mm/mm (null without a bar). */
  barMotionRatio: number | null;
  /** Kinematic roll centre above the ground under the wheels (mean contact-patch height), mm; null when the lines are parallel. */
  rollCentreHeightMm: number | null;
  /** Its lateral position from the vehicle centreline, mm, + left. */
  rollCentreYMm: number | null;
  /** Braking anti feature, % (front: anti-dive, rear: anti-lift); null without `anti`. */
  antiBrakePercent: number | null;
  /** Drive anti feature, % (front: anti-lift in drive, rear: anti-squat); null without `anti`. */
  antiDrivePercent: number | null;
  /** Ackermann, % (steer axis with a wheelbase only; null within 0.5° of straight ahead). */
  ackermannPercent: number | null;
}

export interface OutputCurves {
  axis: OutputCurveAxis;
  trackMm: number;
  rows: OutputCurveRow[];
}

/**
 * Anti feature of a side-view swing arm, %: tanθ · (L/h) · share · 100
 * (Gillespie, Fundamentals of Vehicle Dynamics, ch. 9, from memory), θ from
 * the contact patch for outboard brakes and from the wheel centre for drive
 * through half-shafts; a rear axle takes the opposite sign of tan.
 */
export function antiPercents(sv: SideViewIc, anti: AntiOptions): { brake: number; drive: number } {
  if (!(anti.cgHeightMm > 0)) throw new InputError('anti.cgHeightMm must be positive', [{ path: 'anti.cgHeightMm', message: 'must be positive' }]);
  if (!(anti.wheelbaseMm > 0)) throw new InputError('anti.wheelbaseMm must be positive', [{ path: 'anti.wheelbaseMm', message: 'must be positive' }]);
  const k = anti.wheelbaseMm / anti.cgHeightMm;
  const bf = anti.brakeFrontFraction ?? 0.6;
  const df = anti.driveFrontFraction ?? 0;
  return anti.axle === 'front'
    ? { brake: sv.tanFromContactPatchFront * k * bf * 100, drive: sv.tanFromWheelCentreFront * k * df * 100 }
    : { brake: -sv.tanFromContactPatchFront * k * (1 - bf) * 100, drive: -sv.tanFromWheelCentreFront * k * (1 - df) * 100 };
}

interface Sample {
  x: number;
  travelL: number;
  travelR: number;
  rack: number;
}

function samples(sides: AxleSides, o: OutputCurveOptions): Sample[] {
  const rack = o.rackMm ?? 0;
  if (o.axis === 'travel') {
    if (!o.range) throw new InputError('range is required for a travel sweep', [{ path: 'range', message: 'required' }]);
    return expandRange(o.range, 'range').map((t) => ({ x: t, travelL: t, travelR: t, rack }));
  }
  if (o.axis === 'roll') {
    if (!o.range) throw new InputError('range is required for a roll sweep', [{ path: 'range', message: 'required' }]);
    const rolls = expandRange(o.range, 'range');
    if (rolls.some((p) => Math.abs(p) >= 45)) throw new InputError('range: roll angles must lie within ±45 deg', [{ path: 'range', message: 'outside ±45 deg' }]);
    const half = sides.trackMm / 2;
    return rolls.map((phi) => {
      const s = half * Math.sin(phi / DEG_PER_RAD);
      return { x: phi, travelL: -s, travelR: s, rack };
    });
  }
  if (!sides.left.model.corner.steered) throw new InputError('axis: the corner is not steered, so there is no steer sweep', [{ path: 'axis', message: 'the corner is not steered' }]);
  const travel = o.travelMm ?? 0;
  const a = sides.left.model.rackStroke;
  const b = sides.right.model.rackStroke;
  const lo = Math.max(a[0], b[0]);
  const hi = Math.min(a[1], b[1]);
  const racks = o.range ? expandRange(o.range, 'range') : Array.from({ length: 21 }, (_, i) => lo + ((hi - lo) * i) / 20);
  return racks.map((r) => ({ x: r, travelL: travel, travelR: travel, rack: r }));
}

/** Every per-pose output along one sweep axis (see the module comment). */
export function outputCurves(corner: Corner, options: OutputCurveOptions): OutputCurves {
  const sides = axleSides(corner, options.rightCorner);
  const list = samples(sides, options);
  const racks = [...new Set(list.map((s) => s.rack))];
  checkRack(sides.left.model, racks, options.axis === 'steer' ? 'range' : 'rackMm');
  if (sides.right.model !== sides.left.model) checkRack(sides.right.model, racks, options.axis === 'steer' ? 'range' : 'rackMm');
  // Ackermann is measured from the straight-ahead pose at design height (axle.ts, ACKERMANN_DEFINITION).
  const sa = options.axis === 'steer' && options.wheelbaseMm ? straightAhead(sides) : null;
  const rows = list.map((s): OutputCurveRow => {
    // Each pose walks from the design pose (continuation in ≤ 10 mm steps), so no pose depends on the previous one.
    sides.left.reset();
    sides.left.solve(0, 0);
    sides.left.solveTowards(s.travelL, s.rack);
    sides.right.reset();
    sides.right.solve(0, 0);
    sides.right.solveTowards(s.travelR, s.rack);
    const l = poseOutputs(sides.left);
    const r = poseOutputs(sides.right);
    const rc = rollCentreOf(frontViewIc(sides.left), frontViewIc(sides.right));
    const groundZ = (l.contactPatch[2] + r.contactPatch[2]) / 2;
    const anti = options.anti ? antiPercents(sideViewIc(sides.left), options.anti) : null;
    return {
      x: s.x,
      leftTravelMm: s.travelL,
      rightTravelMm: s.travelR,
      rackMm: s.rack,
      toeDeg: l.toeDeg,
      camberDeg: l.camberDeg,
      steerDeg: l.steerDeg,
      casterDeg: l.casterDeg,
      kingpinInclinationDeg: l.kingpinInclinationDeg,
      scrubRadiusMm: l.scrubRadiusMm,
      mechanicalTrailMm: l.mechanicalTrailMm,
      halfTrackChangeMm: l.halfTrackChangeMm,
      wheelbaseChangeMm: l.wheelCentreShiftXMm,
      springMotionRatio: l.motionRatio ?? null,
      barMotionRatio: l.barMotionRatio ?? null,
      rollCentreHeightMm: rc ? rc.heightMm - groundZ : null,
      rollCentreYMm: rc ? rc.yMm : null,
      antiBrakePercent: anti ? anti.brake : null,
      antiDrivePercent: anti ? anti.drive : null,
      ackermannPercent:
        sa && options.wheelbaseMm ? ackermannPercent(l.steerDeg - sa.leftSteerDeg, r.steerDeg - sa.rightSteerDeg, sa.steeringAxisTrackMm, options.wheelbaseMm) : null,
    };
  });
  return { axis: options.axis, trackMm: sides.trackMm, rows };
}
