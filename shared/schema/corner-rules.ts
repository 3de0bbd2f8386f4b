/**
 * The corner's rules that no shape check can see (run by `cornerSchema` in
 * shared/schema/corner.ts after its shapes): geometry that would leave a
 * link, arm or axis undefined, what each corner type lets a spring, pushrod
 * or drop link ride on, steering that a steered corner needs, and the
 * points and links that may carry a compliance rate. Every message names the
 * point or key involved.
 *
 * No zod here: the editor's page runs these rules on an edit before it is
 * committed (the schema itself stays in the workers, docs/bundles.md).
 */
import type { FieldIssue } from '../errors.js';
import type { Corner, Vec3 } from './corner.js';
import { cornerRangeIssues } from './corner-ranges.js';
import { CORNER_RANGES } from './ranges.js';

/** What a body-mounted lever, rocker or drop link's outer end rides on. */
export const ATTACHMENTS = ['lowerArm', 'upperArm', 'upright'] as const;
export type Attachment = (typeof ATTACHMENTS)[number];

/** Why a corner of `type` cannot carry something on `on` (the message names `path`), or null when it can. */
export function attachmentIssue(type: Corner['type'], path: string, on: Attachment): string | null {
  if (on === 'upperArm' && type !== 'double-wishbone') return `${path} is upperArm but a ${type} corner has no upper arm`;
  if (on === 'lowerArm' && type === 'five-link') return `${path} is lowerArm but a five-link corner has no arm; attach to the upright`;
  return null;
}

/** Largest rate accepted, N/mm (a short solid steel link is about 2e5 N/mm; leave a key out for rigid); shared/schema/ranges.ts. */
export const MAX_RATE_N_PER_MM = CORNER_RANGES.complianceRateNPerMm.max;

/** Point names a bushing may sit at, per corner type. */
export const BUSHING_POINTS = {
  'double-wishbone': ['lowerFront', 'lowerRear', 'upperFront', 'upperRear', 'tieRodInner', 'lowerOuter', 'upperOuter', 'tieRodOuter'],
  strut: ['lowerFront', 'lowerRear', 'strutTop', 'tieRodInner', 'lowerOuter', 'tieRodOuter'],
  'five-link': [1, 2, 3, 4, 5].flatMap((i) => [`link${i}Inner`, `link${i}Outer`]),
} as const;
/** Single links whose own axial stiffness may be given, per corner type. */
export const STIFF_LINKS = { 'double-wishbone': ['tieRod'], strut: ['tieRod'], 'five-link': ['link1', 'link2', 'link3', 'link4', 'link5'] } as const;

/** Coincidence / collinearity tolerance, mm (a link shorter than this is undefined). */
export const GEOMETRY_TOLERANCE_MM = 0.5;

function sub(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!];
}
function norm(a: readonly number[]): number {
  return Math.hypot(a[0]!, a[1]!, a[2]!);
}
function cross(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
}
/** Distance (mm) of p from the line through a and b. */
function distanceToLine(p: readonly number[], a: readonly number[], b: readonly number[]): number {
  const d = sub(b, a);
  return norm(cross(sub(p, a), d)) / norm(d);
}
/** Distance (mm) of p from the line through a with direction d. */
function distanceToAxis(p: readonly number[], a: readonly number[], d: readonly number[]): number {
  return norm(cross(sub(p, a), d)) / norm(d);
}
const fmt = (p: readonly number[]) => `[${p.map((v) => +v.toFixed(3)).join(', ')}]`;

type NamedPoints = Record<string, Vec3>;

/**
 * Geometry rules a corner must satisfy before it can be solved. Returns one
 * issue per broken rule; each path and message names the point.
 */
export function cornerSemanticIssues(corner: Corner): FieldIssue[] {
  const issues: FieldIssue[] = [];
  const tol = GEOMETRY_TOLERANCE_MM;
  const pts = corner.points as NamedPoints;
  const add = (path: string, message: string) => issues.push({ path, message });

  const link = (inner: string, outer: string, what: string) => {
    if (norm(sub(pts[outer]!, pts[inner]!)) < tol) {
      add(`points.${outer}`, `points.${outer} coincides with points.${inner}: the ${what} has no length`);
    }
  };
  const arm = (front: string, rear: string, outer: string, what: string) => {
    if (norm(sub(pts[rear]!, pts[front]!)) < tol) {
      add(`points.${rear}`, `points.${rear} coincides with points.${front}: the ${what}'s pivot axis is undefined`);
    } else if (distanceToLine(pts[outer]!, pts[front]!, pts[rear]!) < tol) {
      add(`points.${outer}`, `points.${outer} lies on the ${what}'s pivot axis (${front}–${rear}): the arm cannot hold the upright`);
    }
  };

  // Wheel and spin axis.
  const wc = pts['wheelCentre']!;
  const sp = pts['spindle']!;
  if (norm(sub(wc, sp)) < tol) add('points.spindle', 'points.spindle coincides with points.wheelCentre: the spin axis is undefined');
  else if (sp[1] >= wc[1]) add('points.spindle', `points.spindle (y ${sp[1]}) must be inboard of points.wheelCentre (y ${wc[1]}) so the spin axis points outboard`);

  if (corner.type === 'double-wishbone') {
    arm('lowerFront', 'lowerRear', 'lowerOuter', 'lower arm');
    arm('upperFront', 'upperRear', 'upperOuter', 'upper arm');
    link('tieRodInner', 'tieRodOuter', 'tie rod');
    link('lowerOuter', 'upperOuter', 'kingpin (lower to upper ball joint)');
    // The steering axis runs through both ball joints; the tie rod needs a lever about it.
    if (norm(sub(pts['upperOuter']!, pts['lowerOuter']!)) >= tol && distanceToLine(pts['tieRodOuter']!, pts['lowerOuter']!, pts['upperOuter']!) < tol) {
      add('points.tieRodOuter', 'points.tieRodOuter lies on the steering axis (lowerOuter–upperOuter, collinear with both ball joints): the tie rod has no lever to hold the steer');
    }
  } else if (corner.type === 'strut') {
    arm('lowerFront', 'lowerRear', 'lowerOuter', 'lower arm');
    link('tieRodInner', 'tieRodOuter', 'tie rod');
    link('strutLower', 'strutTop', 'strut axis');
    // A lower ball joint on the strut axis is well posed (the steering axis is then the strut axis): not refused.
    // The steering axis runs from the lower ball joint to the top mount; the tie rod needs a lever about it.
    if (norm(sub(pts['strutTop']!, pts['lowerOuter']!)) >= tol && distanceToLine(pts['tieRodOuter']!, pts['lowerOuter']!, pts['strutTop']!) < tol) {
      add('points.tieRodOuter', 'points.tieRodOuter lies on the steering axis (lowerOuter–strutTop): the tie rod has no lever to hold the steer');
    }
  } else {
    for (let i = 1; i <= 5; i++) {
      link(`link${i}Inner`, `link${i}Outer`, `link ${i}`);
    }
    for (let i = 1; i <= 5; i++) {
      for (let j = i + 1; j <= 5; j++) {
        if (norm(sub(pts[`link${i}Inner`]!, pts[`link${j}Inner`]!)) < tol && norm(sub(pts[`link${i}Outer`]!, pts[`link${j}Outer`]!)) < tol) {
          add(`points.link${j}Outer`, `points.link${j}Inner/link${j}Outer duplicate link ${i}: five independent links are needed`);
        }
      }
    }
  }

  // Not refused (well posed, the pose Jacobian stays regular; test/shared/kinematics/jacobian.test.ts): a body-side
  // point at the same place as an upright point (a packaging clash, not a singularity), and a body-side point
  // outboard of the wheel centre. Only the side convention is checked: the LEFT corner is entered (y > 0).
  if (!(wc[1] > 0)) add('points.wheelCentre', `points.wheelCentre (y ${wc[1]}) must be on the left (y > 0); enter the LEFT corner`);

  // Steering.
  if (corner.steeringStiffnessNPerMm !== undefined && !corner.steered) {
    add('steeringStiffnessNPerMm', 'steeringStiffnessNPerMm applies to a steered corner only (this corner has a fixed toe link: give its rate as linkAxialNPerMm or a bushing)');
  }
  if (corner.steered && !corner.steering) add('steering', 'steering is required when steered is true (a rack or a steering-box arm)');
  if (corner.steering?.kind === 'rack') {
    const [lo, hi] = corner.steering.rackStroke;
    if (!(lo < hi)) add('steering.rackStroke', `steering.rackStroke [${lo}, ${hi}] must have min < max`);
    else if (lo > 0 || hi < 0) add('steering.rackStroke', `steering.rackStroke [${lo}, ${hi}] does not contain 0 (the design position)`);
    if (norm(corner.steering.rackAxis) < 1e-9) add('steering.rackAxis', 'steering.rackAxis has zero length');
  } else if (corner.steering?.kind === 'arm') {
    const s = corner.steering;
    const [lo, hi] = s.angularStrokeDeg;
    if (!(lo < hi)) add('steering.angularStrokeDeg', `steering.angularStrokeDeg [${lo}, ${hi}] must have min < max`);
    else if (lo > 0 || hi < 0) add('steering.angularStrokeDeg', `steering.angularStrokeDeg [${lo}, ${hi}] does not contain 0 (the design position)`);
    if (norm(s.armAxisDirection) < 1e-9) add('steering.armAxisDirection', 'steering.armAxisDirection has zero length');
    else {
      const tri = corner.type === 'five-link' ? `link${corner.toeLink}Inner` : 'tieRodInner';
      if (distanceToAxis(pts[tri]!, s.armAxisPoint, s.armAxisDirection) < tol) {
        add(`points.${tri}`, `points.${tri} lies on the steering arm's pivot axis: the arm has no length`);
      }
    }
  }

  const checkOn = (path: string, on: Attachment) => {
    const why = attachmentIssue(corner.type, path, on);
    if (why) add(path, why);
  };

  // Springs.
  const sp2 = corner.spring;
  if (sp2?.kind === 'direct') {
    checkOn('spring.springOuterOn', sp2.springOuterOn);
    if (norm(sub(sp2.springOuter, sp2.springBody)) < tol) add('spring.springOuter', 'spring.springOuter coincides with spring.springBody: the spring has no length');
  } else if (sp2?.kind === 'rocker') {
    checkOn('spring.rodOuterOn', sp2.rodOuterOn);
    if (norm(sp2.rockerAxis) < 1e-9) add('spring.rockerAxis', 'spring.rockerAxis has zero length');
    else {
      if (distanceToAxis(sp2.rodRocker, sp2.rockerPivot, sp2.rockerAxis) < tol) add('spring.rodRocker', 'spring.rodRocker lies on the rocker axis: the rocker has no lever for the rod');
      if (distanceToAxis(sp2.springRocker, sp2.rockerPivot, sp2.rockerAxis) < tol) add('spring.springRocker', 'spring.springRocker lies on the rocker axis: the rocker has no lever for the spring');
    }
    if (norm(sub(sp2.rodOuter, sp2.rodRocker)) < tol) add('spring.rodOuter', 'spring.rodOuter coincides with spring.rodRocker: the rod has no length');
    if (norm(sub(sp2.springRocker, sp2.springBody)) < tol) add('spring.springBody', 'spring.springBody coincides with spring.springRocker: the spring has no length');
  }

  // Anti-roll bar.
  const bar = corner.antiRollBar;
  if (bar) {
    checkOn('antiRollBar.dropLinkOuterOn', bar.dropLinkOuterOn);
    if (norm(sub(bar.dropLinkOuter, bar.dropLinkInner)) < tol) add('antiRollBar.dropLinkOuter', 'antiRollBar.dropLinkOuter coincides with antiRollBar.dropLinkInner: the drop link has no length');
    if (norm(bar.barAxisDirection) < 1e-9) add('antiRollBar.barAxisDirection', 'antiRollBar.barAxisDirection has zero length');
    else if (distanceToAxis(bar.dropLinkInner, bar.barAxisPoint, bar.barAxisDirection) < tol) {
      add('antiRollBar.dropLinkInner', `antiRollBar.dropLinkInner ${fmt(bar.dropLinkInner)} lies on the bar axis: the bar has no lever`);
    }
  }
  // Plausible sizes: a kingpin metres long, a point far from its wheel (shared/schema/corner-ranges.ts).
  issues.push(...cornerRangeIssues(corner));
  return issues;
}
